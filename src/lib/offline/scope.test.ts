import { describe, expect, it } from 'vitest';
import { classifyPath, isPatientCache, patientCacheName, replayPath } from './scope';

const ID = '0b5e7a52-3c1d-4f7e-9a8b-1c2d3e4f5a6b';

describe('classifyPath', () => {
	it('knows the two patient pages', () => {
		expect(classifyPath('/today')).toEqual({ kind: 'today' });
		expect(classifyPath(replayPath(ID))).toEqual({ kind: 'replay', item: ID });
	});

	it('knows the four files of a segment', () => {
		for (const file of ['clip.mp4', 'captions.vtt', 'transcript.json', 'poster-0.jpg']) {
			expect(classifyPath(`/api/segments/${ID}/${file}`)).toEqual({
				kind: 'segment-file',
				segment: ID,
				file
			});
		}
	});

	it('leaves everything else alone: staff pages, data requests, other files', () => {
		for (const path of [
			'/today/calendar.ics',
			`/replay/${ID}/__data.json`,
			'/today/__data.json',
			'/replay/not-an-id',
			`/replay/${ID.toUpperCase()}`,
			`/patients/${ID}`,
			`/api/segments/${ID}/clip.webm`,
			`/api/recordings/${ID}/media/rendition.mp4`,
			`/api/segments/${ID}/captions.vtt/x`,
			'/signin'
		]) {
			expect(classifyPath(path), path).toBeNull();
		}
	});
});

describe('patientCacheName', () => {
	it('accepts only keys the server makes', () => {
		const key = 'a'.repeat(32);
		expect(patientCacheName(key)).toBe(`kinelume-patient-${key}`);
		expect(isPatientCache(patientCacheName(key)!)).toBe(true);
		for (const bad of [null, undefined, '', 'a'.repeat(31), 'A'.repeat(32), '../x'.repeat(8)]) {
			expect(patientCacheName(bad)).toBeNull();
		}
		expect(isPatientCache('kinelume-app-1700000000000')).toBe(false);
	});
});
