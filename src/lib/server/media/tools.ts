/*
 * Which ffmpeg and ffprobe Kinelume runs. Order: the FFMPEG_PATH / FFPROBE_PATH setting; else
 * Debian's package (/usr/bin), which gets security updates; else the static builds inside the
 * @ffmpeg-installer / @ffprobe-installer npm packages, which never change (ffmpeg from 2018) and
 * are there so a clone runs anywhere. Pure: the caller says what exists, so tests need no machine.
 */

export type MediaTool = 'ffmpeg' | 'ffprobe';

/** Where the chosen executable came from, in the words the admin health report uses. */
export type ToolSource = 'setting' | 'system' | 'bundled';

export interface ChosenTool {
	path: string;
	source: ToolSource;
}

/** Debian's `ffmpeg` package installs both tools here. */
export const SYSTEM_TOOLS: Record<MediaTool, string> = {
	ffmpeg: '/usr/bin/ffmpeg',
	ffprobe: '/usr/bin/ffprobe'
};

export const TOOL_SETTINGS: Record<MediaTool, 'FFMPEG_PATH' | 'FFPROBE_PATH'> = {
	ffmpeg: 'FFMPEG_PATH',
	ffprobe: 'FFPROBE_PATH'
};

export interface ToolChoiceInput {
	/** FFMPEG_PATH or FFPROBE_PATH; empty or missing means unset. */
	setting?: string;
	/** Whether this user may run the file at a path. */
	isExecutable: (path: string) => boolean;
	/** The npm package's binary; only asked for when needed (its package may be missing). */
	bundled: () => string;
}

/**
 * The executable to run for `tool`: the setting when given (even if it cannot be run, so that a
 * wrong setting is reported rather than silently replaced), else the system copy when it can be
 * run, else the bundled one.
 */
export function chooseTool(tool: MediaTool, input: ToolChoiceInput): ChosenTool {
	const setting = input.setting?.trim();
	if (setting) return { path: setting, source: 'setting' };
	const system = SYSTEM_TOOLS[tool];
	if (input.isExecutable(system)) return { path: system, source: 'system' };
	return { path: input.bundled(), source: 'bundled' };
}

/** ffmpeg's first `-version` line without its copyright, e.g. `ffmpeg version 5.1.8-0+deb12u1`. */
export function versionLine(output: string): string {
	const first = output.split('\n', 1)[0].trim();
	return first.replace(/\s+Copyright .*$/, '');
}
