import { describe, expect, it } from 'vitest';
import { clinicPrefix, keySegment, libraryKeys, recordingKeys } from './keys';

describe('storage keys', () => {
	it('lays out a recording under its clinic', () => {
		const keys = recordingKeys('c-1', 'r_2');
		expect(keys.prefix).toBe('clinics/c-1/recordings/r_2/');
		expect(keys.original).toBe('clinics/c-1/recordings/r_2/original');
		expect(keys.rendition).toBe('clinics/c-1/recordings/r_2/rendition.mp4');
		expect(keys.poster(0)).toBe('clinics/c-1/recordings/r_2/posters/0.jpg');
		expect(keys.segment('s3')).toBe('clinics/c-1/recordings/r_2/segments/s3.mp4');
		expect(keys.segmentPoster('s3', 1)).toBe(
			'clinics/c-1/recordings/r_2/segments/s3/posters/1.jpg'
		);
		expect(clinicPrefix('c-1')).toBe('clinics/c-1/');
	});

	it('puts the smaller versions beside the rendition and in the segment’s folder', () => {
		const keys = recordingKeys('c-1', 'r_2');
		expect(keys.renditionVersion(360)).toBe('clinics/c-1/recordings/r_2/rendition-360.mp4');
		expect(keys.segmentVersion('s3', 540)).toBe(
			'clinics/c-1/recordings/r_2/segments/s3/clip-540.mp4'
		);
		expect(keys.segmentFolder('s3')).toBe('clinics/c-1/recordings/r_2/segments/s3/');
		expect(libraryKeys('v1').segmentVersion('a', 360)).toBe('library/v1/segments/a/clip-360.mp4');
		expect(() => keys.renditionVersion(361)).toThrow(/Invalid version/);
		expect(() => keys.segmentVersion('s3', NaN)).toThrow(/Invalid version/);
	});

	it('lays out a published library version', () => {
		const keys = libraryKeys('v2024.1');
		expect(keys.prefix).toBe('library/v2024.1/');
		expect(keys.rendition).toBe('library/v2024.1/rendition.mp4');
		expect(keys.poster(12)).toBe('library/v2024.1/posters/12.jpg');
		expect(keys.segment('a')).toBe('library/v2024.1/segments/a.mp4');
	});

	it.each(['', '..', 'a/b', 'a..b', '../x', '.hidden', 'a b', 'é', 'x'.repeat(129)])(
		'refuses %j as an id',
		(id) => {
			expect(() => keySegment(id)).toThrow(/Invalid id/);
			expect(() => recordingKeys('clinic', id)).toThrow(/recording id/);
			expect(() => recordingKeys(id, 'recording')).toThrow(/clinic id/);
		}
	);

	it('refuses poster indexes that are not whole non-negative numbers', () => {
		const keys = recordingKeys('c', 'r');
		for (const index of [-1, 1.5, Number.NaN])
			expect(() => keys.poster(index)).toThrow(/poster index/);
		expect(() => keys.segment('../../other')).toThrow(/segment id/);
		expect(() => keys.segmentPoster('../x', 0)).toThrow(/segment id/);
		expect(() => keys.segmentPoster('s', -1)).toThrow(/poster index/);
	});
});
