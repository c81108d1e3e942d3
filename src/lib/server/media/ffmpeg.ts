import { spawn } from 'node:child_process';
import fluent, { type FfmpegCommand } from 'fluent-ffmpeg';
import { accessSync, constants } from 'node:fs';
import { createRequire } from 'node:module';
import { setPriority } from 'node:os';
import type { Writable } from 'node:stream';
import { config } from '../config';
import { withMediaSlot } from './slots';
import { chooseTool, TOOL_SETTINGS, versionLine, type ChosenTool, type MediaTool } from './tools';

/*
 * The one way Kinelume runs ffmpeg and ffprobe: the app, the worker, the demo renderer and the
 * benchmarks all call `runFfmpeg` / `runFfprobe` here, with the binaries chosen in tools.ts.
 * It spawns the binaries itself rather than through fluent-ffmpeg (which the project no longer
 * uses; see DEVELOPERS.md, "ffmpeg"): fluent-ffmpeg 2.1.3 cannot hand ffmpeg an extra pipe for
 * progress (we use fd 3 so stdout stays free for PCM), takes no AbortSignal, reports progress by
 * parsing stderr after an extra ffprobe run of its own, stops a timed-out process without
 * waiting for it to exit, and its ffprobe wrapper parses the INI-style output, which drops the
 * display-matrix side data that carries a phone's rotation. The argument lists are short and
 * are written out where they are used (outputs.ts, probe.ts, stills.ts, cut.ts, detect.ts).
 */

/** A media failure with a message fit to show a clinician; `detail` holds ffmpeg's own words. */
export class MediaError extends Error {
	constructor(
		message: string,
		readonly kind: 'unreadable' | 'failed' | 'timeout' | 'aborted' | 'unavailable' = 'failed',
		readonly detail = ''
	) {
		super(message);
		this.name = 'MediaError';
	}
}

const require = createRequire(import.meta.url);

function isExecutable(path: string): boolean {
	try {
		accessSync(path, constants.X_OK);
		return true;
	} catch {
		return false;
	}
}

const BUNDLED: Record<MediaTool, () => string> = {
	ffmpeg: () => (require('@ffmpeg-installer/ffmpeg') as { path: string }).path,
	ffprobe: () => (require('@ffprobe-installer/ffprobe') as { path: string }).path
};

const chosen = new Map<MediaTool, ChosenTool>();

/** The executable run for `tool`, and where it came from (tools.ts); checked once per process. */
export function mediaTool(tool: MediaTool): ChosenTool {
	const known = chosen.get(tool);
	if (known) return known;
	const variable = TOOL_SETTINGS[tool];
	const choice = chooseTool(tool, {
		setting: config()[variable],
		isExecutable,
		bundled: BUNDLED[tool]
	});
	if (!isExecutable(choice.path)) {
		// @ffprobe-installer installs its binary as mode 744, so only the installing user may run it.
		throw new MediaError(
			`The media tool at ${choice.path} cannot be run by this user. Make it executable (chmod 755), install Debian's ffmpeg package, or set ${variable} to another copy.`,
			'unavailable'
		);
	}
	chosen.set(tool, choice);
	return choice;
}

/** The ffmpeg executable: FFMPEG_PATH, else Debian's /usr/bin/ffmpeg, else the npm package's. */
export function ffmpegPath(): string {
	return mediaTool('ffmpeg').path;
}

/** The ffprobe executable: FFPROBE_PATH, else Debian's /usr/bin/ffprobe, else the npm package's. */
export function ffprobePath(): string {
	return mediaTool('ffprobe').path;
}

/** What the admin health report says of one tool. */
export interface MediaToolReport {
	ok: boolean;
	path: string;
	source: ChosenTool['source'] | null;
	/** The first line of `-version`, or why it could not be run. */
	detail: string;
}

const reports = new Map<MediaTool, Promise<MediaToolReport>>();

/**
 * Runs `<tool> -version` once per process and reports which binary runs, from where, and its
 * version line. A failure is not kept, so a fixed installation shows up without a restart.
 */
export function mediaToolReport(tool: MediaTool): Promise<MediaToolReport> {
	let report = reports.get(tool);
	if (!report) {
		report = readVersion(tool);
		reports.set(tool, report);
		void report.then((r) => {
			if (!r.ok) reports.delete(tool);
		});
	}
	return report;
}

async function readVersion(tool: MediaTool): Promise<MediaToolReport> {
	let choice: ChosenTool;
	try {
		choice = mediaTool(tool);
	} catch (error) {
		return { ok: false, path: '', source: null, detail: messageOf(error) };
	}
	try {
		const { stdout } = await runMedia(choice.path, ['-version'], { timeoutSeconds: 10 });
		return { ok: true, path: choice.path, source: choice.source, detail: versionLine(stdout) };
	} catch (error) {
		const detail = error instanceof MediaError && error.detail ? error.detail : messageOf(error);
		return { ok: false, path: choice.path, source: choice.source, detail };
	}
}

function messageOf(error: unknown): string {
	return error instanceof Error ? error.message : String(error);
}

const NICE_CANDIDATES = ['/usr/bin/nice', '/bin/nice'];
let niceBinary: string | null | undefined;

function findNice(): string | null {
	if (niceBinary !== undefined) return niceBinary;
	niceBinary = null;
	if (process.platform !== 'win32') {
		for (const candidate of NICE_CANDIDATES) {
			try {
				accessSync(candidate, constants.X_OK);
				niceBinary = candidate;
				break;
			} catch {
				// not here; try the next place
			}
		}
	}
	return niceBinary;
}

/** Below-normal priority, so a rendition never slows page responses on a shared machine. */
const NICENESS = 10;

/** Local files in, local files or pipes out: never the network, whatever a file refers to. */
export const PROTOCOL_WHITELIST = 'file,pipe';

/**
 * For an input that is a presigned URL of our own storage (a rendition we made), read with HTTP
 * ranges. Only the caller that made the URL passes it, in front of that one `-i`.
 */
export const STORAGE_URL_WHITELIST = 'http,https,tcp,tls';

export interface MediaProgress {
	/** Seconds of output written so far. */
	outTimeSeconds: number;
	/** Encoding speed as a multiple of real time, when ffmpeg reports it. */
	speed: number | null;
}

export interface RunOptions {
	/** Wall-clock limit; the process is killed when it passes. Default MEDIA_JOB_TIMEOUT_SECONDS. */
	timeoutSeconds?: number;
	signal?: AbortSignal;
	/** ffmpeg only: called as `-progress` reports arrive. */
	onProgress?: (progress: MediaProgress) => void;
	/** Receives stdout as it arrives; without it stdout is collected and returned. */
	onStdout?: (chunk: Buffer) => void;
	/**
	 * ffmpeg only: written to its standard input (read with `-i pipe:0`) as fast as it takes it;
	 * stdin is closed when this ends. A throw stops the run with that error.
	 */
	input?: AsyncIterable<Uint8Array>;
	/**
	 * ffmpeg only: whether to wait for one of the machine's slots first (default true). Only
	 * tools that run without the app's database (the demo renderer) pass false.
	 */
	slot?: boolean;
}

export interface RunResult {
	stdout: string;
	stderr: string;
}

// Enough of stderr to explain a failure without holding a whole verbose log in memory.
const STDERR_KEEP = 16 * 1024;
const STDOUT_LIMIT = 64 * 1024 * 1024;

/**
 * Runs ffmpeg with the constraints every media job needs: protocol whitelist on each input,
 * lowered priority, a wall-clock timeout, cancellation through `signal`, and progress read from
 * `-progress pipe:3`, and at most FFMPEG_MAX_CONCURRENT runs at once on the machine. `args` are
 * what follows `ffmpeg -hide_banner -nostdin`; `-i` inputs get the
 * whitelist added in front of them. Resolves when ffmpeg exits 0; rejects with MediaError only
 * once the process has exited, so nothing keeps running after a rejection.
 */
export function runFfmpeg(args: string[], options: RunOptions = {}): Promise<RunResult> {
	const withProgress = options.onProgress ? ['-progress', 'pipe:3', '-nostats'] : [];
	const binary = ffmpegPath();
	const run = () =>
		runMedia(
			binary,
			[
				'-hide_banner',
				// -nostdin stops ffmpeg reading keys from stdin; `-i pipe:0` still reads an input.
				'-nostdin',
				'-loglevel',
				'error',
				...withProgress,
				...whitelistInputs(args)
			],
			options
		);
	if (options.slot === false) return run();
	// One of the machine's FFMPEG_MAX_CONCURRENT slots first (slots.ts); the time limit counts
	// from the start of the run, not the wait.
	return withMediaSlot(run, { signal: options.signal });
}

/**
 * A command written with fluent-ffmpeg's builder: named steps (`seekInput`, `videoFilters`,
 * `outputOptions`…) instead of a hand-kept argument list. It is only the builder: the command is
 * run by `runCommand`, i.e. by `runFfmpeg` with every constraint above (whitelist, slots,
 * priority, timeout, cancellation), never by fluent-ffmpeg's own runner (DEVELOPERS.md, ffmpeg).
 */
export function ffmpegCommand(input: string): FfmpegCommand {
	return fluent(input);
}

/** The arguments a built command stands for, in ffmpeg's order (inputs, filters, outputs). */
export function commandArguments(command: FfmpegCommand): string[] {
	// fluent-ffmpeg lists them with `_getArguments`, the call its own runner makes; the package is
	// pinned (and no longer changes upstream), so this inner name stays as it is.
	return (command as unknown as { _getArguments(): string[] })._getArguments();
}

/** Runs a command built with `ffmpegCommand` through `runFfmpeg`. */
export function runCommand(command: FfmpegCommand, options: RunOptions = {}): Promise<RunResult> {
	return runFfmpeg(commandArguments(command), options);
}

/**
 * Runs ffprobe under the same constraints; `args` should name the input with `-i`. A probe reads
 * only the container's index, so it takes no ffmpeg slot.
 */
export function runFfprobe(args: string[], options: RunOptions = {}): Promise<RunResult> {
	return runMedia(ffprobePath(), ['-hide_banner', '-v', 'error', ...whitelistInputs(args)], {
		...options,
		onProgress: undefined,
		input: undefined
	});
}

/** Puts the local-only whitelist in front of every `-i` that does not name its own. */
function whitelistInputs(args: string[]): string[] {
	const out: string[] = [];
	for (let i = 0; i < args.length; i++) {
		if (args[i] === '-i' && args[i - 2] !== '-protocol_whitelist') {
			out.push('-protocol_whitelist', PROTOCOL_WHITELIST);
		}
		out.push(args[i]);
	}
	return out;
}

function runMedia(binary: string, args: string[], options: RunOptions): Promise<RunResult> {
	const { signal, onProgress, onStdout, input } = options;
	const timeoutSeconds = options.timeoutSeconds ?? config().MEDIA_JOB_TIMEOUT_SECONDS;
	if (signal?.aborted) {
		return Promise.reject(new MediaError('Processing was cancelled.', 'aborted'));
	}

	const nice = findNice();
	const [command, commandArgs] = nice
		? [nice, ['-n', String(NICENESS), binary, ...args]]
		: [binary, args];

	return new Promise<RunResult>((resolve, reject) => {
		const child = spawn(command, commandArgs, {
			stdio: [input ? 'pipe' : 'ignore', 'pipe', 'pipe', onProgress ? 'pipe' : 'ignore'],
			windowsHide: true
		});
		if (!nice && child.pid !== undefined) {
			try {
				setPriority(child.pid, NICENESS);
			} catch {
				// The job still runs at normal priority; not worth failing it for.
			}
		}

		let stopped: Error | null = null;
		const stop = (reason: Error) => {
			if (stopped) return;
			stopped = reason;
			// SIGKILL: the output is thrown away anyway, and a graceful SIGTERM lets ffmpeg spend
			// seconds finishing a long encode's trailer.
			child.kill('SIGKILL');
		};

		// A caller's callback that throws ends the run with its error instead of crashing the process.
		const guarded =
			<T>(callback: (value: T) => void) =>
			(value: T) => {
				if (stopped) return;
				try {
					callback(value);
				} catch (error) {
					stop(error instanceof Error ? error : new Error(String(error)));
				}
			};

		const timer = setTimeout(
			() =>
				stop(
					new MediaError(
						`Processing took longer than ${describeSeconds(timeoutSeconds)} and was stopped.`,
						'timeout'
					)
				),
			// setTimeout cannot wait longer than about 24 days.
			Math.min(timeoutSeconds * 1000, 2 ** 31 - 1)
		);
		const onAbort = () => stop(new MediaError('Processing was cancelled.', 'aborted'));
		signal?.addEventListener('abort', onAbort, { once: true });

		const stdoutChunks: Buffer[] = [];
		let stdoutBytes = 0;
		const toCaller = onStdout ? guarded(onStdout) : null;
		child.stdout!.on('data', (chunk: Buffer) => {
			if (toCaller) toCaller(chunk);
			else if (stdoutBytes < STDOUT_LIMIT) {
				stdoutChunks.push(chunk);
				stdoutBytes += chunk.length;
			}
		});
		let stderr = '';
		child.stderr!.on('data', (chunk: Buffer) => {
			stderr = (stderr + chunk.toString('utf8')).slice(-STDERR_KEEP);
		});
		const progressPipe = child.stdio[3];
		if (onProgress && progressPipe && 'on' in progressPipe) {
			readProgress(progressPipe as NodeJS.ReadableStream, guarded(onProgress));
		}

		let exited = false;
		let markExited = () => {};
		const exit = new Promise<void>((resolve) => (markExited = resolve));
		if (input && child.stdin) {
			feed(child.stdin, input, exit, () => exited || stopped !== null).catch((error: unknown) =>
				stop(error instanceof Error ? error : new Error(String(error)))
			);
		}

		const finish = () => {
			exited = true;
			markExited();
			clearTimeout(timer);
			signal?.removeEventListener('abort', onAbort);
		};
		child.on('error', (error) => {
			// Only a failed spawn leaves no pid; then no 'close' is promised either.
			if (child.pid !== undefined) return;
			finish();
			reject(
				new MediaError(
					'The media tools could not be started.',
					'unavailable',
					`${binary}: ${error.message}`
				)
			);
		});
		child.on('close', (code, exitSignal) => {
			finish();
			if (child.pid === undefined) return;
			if (stopped) return reject(stopped);
			if (code !== 0) {
				return reject(
					new MediaError(
						'The video could not be processed.',
						'failed',
						`${stderr.trim()} (exit ${code ?? exitSignal})`
					)
				);
			}
			resolve({ stdout: Buffer.concat(stdoutChunks).toString('utf8'), stderr });
		});
	});
}

/** Writes `input` to stdin, waiting for the pipe to drain, until it ends or the run is over. */
async function feed(
	stdin: Writable,
	input: AsyncIterable<Uint8Array>,
	exit: Promise<void>,
	over: () => boolean
): Promise<void> {
	// An ffmpeg that stops early closes the pipe (EPIPE); its exit code and stderr say why.
	stdin.on('error', () => {});
	for await (const chunk of input) {
		if (over()) break;
		// Racing the exit keeps a dead ffmpeg from leaving us waiting for a drain forever.
		if (!stdin.write(chunk)) await Promise.race([new Promise((r) => stdin.once('drain', r)), exit]);
	}
	stdin.end();
}

function describeSeconds(seconds: number): string {
	if (seconds % 60 === 0 && seconds >= 60) {
		const minutes = seconds / 60;
		return minutes === 1 ? '1 minute' : `${minutes} minutes`;
	}
	return seconds === 1 ? '1 second' : `${seconds} seconds`;
}

/** Reads ffmpeg's `-progress` key=value blocks; each block ends with a `progress=` line. */
function readProgress(
	stream: NodeJS.ReadableStream,
	onProgress: (progress: MediaProgress) => void
): void {
	let buffered = '';
	let outTimeSeconds = 0;
	let speed: number | null = null;
	stream.on('data', (chunk: Buffer | string) => {
		buffered += chunk.toString();
		const lines = buffered.split('\n');
		buffered = lines.pop() ?? '';
		for (const line of lines) {
			const equals = line.indexOf('=');
			if (equals < 0) continue;
			const key = line.slice(0, equals).trim();
			const value = line.slice(equals + 1).trim();
			if (key === 'out_time') {
				const seconds = parseClock(value);
				if (seconds !== null) outTimeSeconds = seconds;
			} else if (key === 'speed') {
				const parsed = Number.parseFloat(value);
				speed = Number.isFinite(parsed) ? parsed : null;
			} else if (key === 'progress') {
				onProgress({ outTimeSeconds, speed });
			}
		}
	});
	// A broken progress pipe does not fail the job: the exit code decides that.
	stream.on('error', () => {});
}

/** Seconds from ffmpeg's `HH:MM:SS.micro` (`out_time`); the `_ms`/`_us` keys differ by version. */
function parseClock(value: string): number | null {
	const match = /^(-?)(\d+):(\d{2}):(\d{2}(?:\.\d+)?)$/.exec(value);
	if (!match) return null;
	const seconds = Number(match[2]) * 3600 + Number(match[3]) * 60 + Number(match[4]);
	return match[1] ? 0 : seconds;
}
