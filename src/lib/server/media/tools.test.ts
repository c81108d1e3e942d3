import { describe, expect, it } from 'vitest';
import { chooseTool, SYSTEM_TOOLS, versionLine, type ToolChoiceInput } from './tools';

const BUNDLED_FFMPEG = '/app/node_modules/@ffmpeg-installer/linux-x64/ffmpeg';

/** A machine where only `present` can be run; asking for the bundled copy is counted. */
function machine(present: string[], setting?: string) {
	const asked = { bundled: 0 };
	const input: ToolChoiceInput = {
		setting,
		isExecutable: (path) => present.includes(path),
		bundled: () => {
			asked.bundled++;
			return BUNDLED_FFMPEG;
		}
	};
	return { input, asked };
}

describe('chooseTool', () => {
	it("prefers Debian's ffmpeg when it is installed, without loading the npm package", () => {
		const { input, asked } = machine([SYSTEM_TOOLS.ffmpeg, BUNDLED_FFMPEG]);
		expect(chooseTool('ffmpeg', input)).toEqual({ path: '/usr/bin/ffmpeg', source: 'system' });
		expect(asked.bundled).toBe(0);
	});

	it('falls back to the npm build when there is no system copy', () => {
		const { input } = machine([BUNDLED_FFMPEG]);
		expect(chooseTool('ffmpeg', input)).toEqual({ path: BUNDLED_FFMPEG, source: 'bundled' });
	});

	it('falls back to the npm build when the system copy cannot be run by this user', () => {
		// isExecutable answers for this user: a file that exists but lacks the x bit counts as absent.
		const { input } = machine([]);
		expect(chooseTool('ffprobe', input).source).toBe('bundled');
	});

	it('looks for ffprobe at its own system path', () => {
		const { input } = machine([SYSTEM_TOOLS.ffprobe]);
		expect(chooseTool('ffprobe', input)).toEqual({ path: '/usr/bin/ffprobe', source: 'system' });
		expect(chooseTool('ffmpeg', input).source).toBe('bundled');
	});

	it('uses the setting over everything, even one that cannot be run, so it is reported', () => {
		const { input, asked } = machine([SYSTEM_TOOLS.ffmpeg], '/opt/ffmpeg-7/bin/ffmpeg');
		expect(chooseTool('ffmpeg', input)).toEqual({
			path: '/opt/ffmpeg-7/bin/ffmpeg',
			source: 'setting'
		});
		expect(asked.bundled).toBe(0);
	});

	it('treats an empty or blank setting as unset', () => {
		expect(chooseTool('ffmpeg', machine([SYSTEM_TOOLS.ffmpeg], '').input).source).toBe('system');
		expect(chooseTool('ffmpeg', machine([SYSTEM_TOOLS.ffmpeg], '  ').input).source).toBe('system');
	});
});

describe('versionLine', () => {
	it("keeps the version and drops the copyright of Debian's build", () => {
		const out =
			'ffmpeg version 5.1.8-0+deb12u1 Copyright (c) 2000-2025 the FFmpeg developers\nbuilt with gcc 12';
		expect(versionLine(out)).toBe('ffmpeg version 5.1.8-0+deb12u1');
	});

	it('reads a static build, whose line has no distribution suffix', () => {
		const out =
			'ffmpeg version N-47683-g0e8eb07980-static  Copyright (c) 2000-2018 the FFmpeg developers\n';
		expect(versionLine(out)).toBe('ffmpeg version N-47683-g0e8eb07980-static');
	});
});
