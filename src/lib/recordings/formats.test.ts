import { describe, expect, it } from 'vitest';
import {
	formatBytes,
	formatDuration,
	parseRecordingTitle,
	titleFromFilename,
	uploadType
} from './formats';

describe('upload types', () => {
	it('takes the type from the extension when the browser names none', () => {
		expect(uploadType('knee.MOV', '', 10)).toEqual({ contentType: 'video/quicktime' });
		expect(uploadType('knee.m4v', 'application/octet-stream', 10)).toEqual({
			contentType: 'video/x-m4v'
		});
		expect(uploadType('knee.webm', 'video/webm', 10)).toEqual({ contentType: 'video/webm' });
	});

	it('refuses other files, empty ones and ones over 2 GB with a sentence', () => {
		expect(uploadType('notes.txt', 'text/plain', 10)).toHaveProperty('refusal');
		expect(uploadType('knee.mp4', 'video/mp4', 0)).toMatchObject({
			refusal: expect.stringMatching(/empty/)
		});
		expect(uploadType('knee.mp4', 'video/mp4', 2 * 1024 ** 3 + 1)).toMatchObject({
			refusal: expect.stringMatching(/2 GB/)
		});
	});
});

describe('recording words', () => {
	it('makes a title from a file name', () => {
		expect(titleFromFilename('sit_to-stand.final.mp4')).toBe('sit to stand.final');
		expect(titleFromFilename('.mp4')).toBe('Untitled recording');
	});

	it('writes lengths and sizes as people read them', () => {
		expect(formatDuration(65.4)).toBe('1 min 5 s');
		expect(formatDuration(3723)).toBe('1 h 2 min 3 s');
		expect(formatDuration(null)).toBe('—');
		expect(formatBytes(999)).toBe('999 bytes');
		expect(formatBytes(400_123)).toBe('400 kB');
		expect(formatBytes(2_500_000)).toBe('2.5 MB');
	});
});

describe('renaming a recording', () => {
	it('keeps a tidy title and refuses an empty, long or control-character one in words', () => {
		expect(parseRecordingTitle('  Shoulder   set one ')).toEqual({
			ok: true,
			title: 'Shoulder set one'
		});
		expect(parseRecordingTitle('   ')).toEqual({
			ok: false,
			message: 'Give the recording a title.'
		});
		expect(parseRecordingTitle('a'.repeat(121))).toMatchObject({ ok: false });
		expect(parseRecordingTitle('Knee\u0007 set')).toEqual({
			ok: false,
			message: 'A title cannot hold control characters.'
		});
	});
});
