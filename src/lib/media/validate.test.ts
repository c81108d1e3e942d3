import { describe, expect, it } from 'vitest';
import {
	declaredUploadProblem,
	MAX_DURATION_SECONDS,
	refusalReason,
	type DeclaredUpload,
	type ProbeResult
} from './validate';

function probe(changes: Partial<ProbeResult> = {}): ProbeResult {
	return {
		formatName: 'mov,mp4,m4a,3gp,3g2,mj2',
		durationSeconds: 42.5,
		sizeBytes: 5_000_000,
		bitRate: 941_176,
		video: {
			codec: 'h264',
			width: 1920,
			height: 1080,
			displayWidth: 1920,
			displayHeight: 1080,
			rotation: 0,
			frameRate: 30,
			pixelFormat: 'yuv420p'
		},
		audio: { codec: 'aac', sampleRate: 48000, channels: 2 },
		...changes
	};
}

function upload(changes: Partial<DeclaredUpload> = {}): DeclaredUpload {
	return { filename: 'knee-bends.mp4', contentType: 'video/mp4', sizeBytes: 5_000_000, ...changes };
}

describe('declaredUploadProblem', () => {
	it('takes each allowed type with a matching extension', () => {
		for (const [filename, contentType] of [
			['a.mp4', 'video/mp4'],
			['a.MOV', 'video/quicktime'],
			['a.m4v', 'video/x-m4v'],
			['a.webm', 'video/webm'],
			['a.mov', 'video/mp4'],
			['a.webm', 'video/webm; codecs="vp9, opus"']
		]) {
			expect(declaredUploadProblem(upload({ filename, contentType })), filename).toBeNull();
		}
	});

	it('refuses other extensions, types and mixed-up pairs', () => {
		expect(declaredUploadProblem(upload({ filename: 'notes.txt' }))).toMatch(/not a video file/);
		expect(declaredUploadProblem(upload({ filename: 'clip' }))).toMatch(/not a video file/);
		expect(declaredUploadProblem(upload({ contentType: 'video/x-msvideo' }))).toMatch(
			/not a video type/
		);
		expect(declaredUploadProblem(upload({ contentType: '' }))).toMatch(/an unknown type/);
		expect(declaredUploadProblem(upload({ contentType: 'video/webm' }))).toMatch(
			/does not match its name/
		);
	});

	it('refuses empty and oversized files', () => {
		expect(declaredUploadProblem(upload({ sizeBytes: 0 }))).toMatch(/is empty/);
		expect(declaredUploadProblem(upload({ sizeBytes: 2 * 1024 ** 3 }))).toBeNull();
		expect(declaredUploadProblem(upload({ sizeBytes: 2 * 1024 ** 3 + 1 }))).toMatch(/at most 2 GB/);
	});
});

describe('refusalReason', () => {
	it('accepts a readable recording that matches its declaration', () => {
		expect(refusalReason(probe(), upload())).toBeNull();
		expect(
			refusalReason(
				probe({ formatName: 'matroska,webm' }),
				upload({ filename: 'a.webm', contentType: 'video/webm' })
			)
		).toBeNull();
	});

	it('explains an unreadable file', () => {
		expect(refusalReason(null, upload())).toMatch(/could not read “knee-bends.mp4” as a video/);
	});

	it('explains a file without a picture', () => {
		expect(refusalReason(probe({ video: null }), upload())).toMatch(/no video track/);
	});

	it('explains a zero or unknown duration', () => {
		expect(refusalReason(probe({ durationSeconds: 0 }), upload())).toMatch(/duration is zero/);
		expect(refusalReason(probe({ durationSeconds: Number.NaN }), upload())).toMatch(/zero/);
	});

	it('takes exactly 60 minutes and refuses more', () => {
		expect(refusalReason(probe({ durationSeconds: MAX_DURATION_SECONDS }), upload())).toBeNull();
		expect(refusalReason(probe({ durationSeconds: 61 * 60 }), upload())).toMatch(
			/about 61 minutes long; recordings can be at most 60 minutes/
		);
	});

	it('explains contents that do not match the name', () => {
		expect(refusalReason(probe({ formatName: 'matroska,webm' }), upload())).toMatch(
			/named like an MP4 or MOV file but its contents are something else/
		);
		expect(
			refusalReason(probe(), upload({ filename: 'a.webm', contentType: 'video/webm' }))
		).toMatch(/named like a WebM file/);
		expect(refusalReason(probe({ formatName: 'avi' }), upload())).toMatch(/something else/);
	});

	it('explains an upload whose size differs from what was declared', () => {
		expect(refusalReason(probe({ sizeBytes: 2_500_000 }), upload())).toMatch(
			/arrived as 2.4 MB but should be 4.8 MB/
		);
	});

	it('puts declaration problems first', () => {
		expect(refusalReason(null, upload({ filename: 'a.avi' }))).toMatch(/not a video file/);
	});
});
