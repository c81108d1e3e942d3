import { describe, expect, it } from 'vitest';
import { FONTS_HELD, holdForFirstFrame, SCRIPT_HOLD_MS, SECONDS_IN_HAND } from './replay-first';

// The start-up SvelteKit writes at the end of <body> (its page renderer's template, split bundle).
const KIT_PAGE = `<!doctype html>
<html lang="en">
<head></head><body><main><video></video></main>
			<script nonce="abc">
				{
					__sveltekit_x = { base: new URL(".", location).pathname.slice(0, -1) };
					const element = document.currentScript.parentElement;
					Promise.all([
						import("./_app/immutable/entry/start.js"),
						import("./_app/immutable/entry/app.js")
					]).then(([kit, app]) => {
						kit.start(app, element, { node_ids: [0, 2] });
					});
				}
			</script></body></html>`;

type Listener = (event?: { target: unknown }) => void;

/** What the stand-in video reports; a test changes it, then fires an event. */
interface VideoState {
	readyState: number;
	error: unknown;
	/** 3 is NETWORK_NO_SOURCE: every <source> failed. */
	networkState: number;
	paused: boolean;
	currentTime: number;
	duration: number;
	/** Buffered ranges, seconds. */
	ranges: [number, number][];
}

const idle = (): VideoState => ({
	readyState: 0,
	error: null,
	networkState: 2,
	paused: false,
	currentTime: 0,
	duration: 20,
	ranges: []
});

/** Runs the page's start-up script against a stand-in document; says when the app started. */
function boot(html: string, state: VideoState | null) {
	const script = html.slice(
		html.indexOf('>', html.indexOf('<script')) + 1,
		html.indexOf('</script>')
	);
	const videoListeners = new Map<string, Listener[]>();
	const windowListeners = new Map<string, Listener>();
	const timers: (() => void)[] = [];
	const started: string[] = [];
	const root = { held: html.includes(`<html ${FONTS_HELD}`) };
	const video = state && {
		get readyState() {
			return state.readyState;
		},
		get error() {
			return state.error;
		},
		get networkState() {
			return state.networkState;
		},
		get paused() {
			return state.paused;
		},
		get currentTime() {
			return state.currentTime;
		},
		get duration() {
			return state.duration;
		},
		get buffered() {
			return {
				length: state.ranges.length,
				start: (i: number) => state.ranges[i][0],
				end: (i: number) => state.ranges[i][1]
			};
		},
		addEventListener: (name: string, fn: Listener) =>
			videoListeners.set(name, [...(videoListeners.get(name) ?? []), fn])
	};
	const run = new Function(
		'document',
		'location',
		'addEventListener',
		'setTimeout',
		'load',
		// Dynamic import cannot be stood in for inside a function body: the same call, renamed.
		script.replaceAll('import(', 'load(')
	);
	run(
		{
			currentScript: { parentElement: {} },
			querySelector: () => video,
			documentElement: {
				removeAttribute: (name: string) => {
					if (name === FONTS_HELD) root.held = false;
				}
			}
		},
		'http://localhost/replay/1',
		(name: string, fn: Listener) => windowListeners.set(name, fn),
		(fn: () => void, ms: number) => {
			expect(ms).toBe(SCRIPT_HOLD_MS);
			timers.push(fn);
		},
		async (url: string) =>
			url.endsWith('start.js') ? { start: () => started.push('started') } : { app: true }
	);
	const settle = () => new Promise((r) => setTimeout(r, 0));
	/** Fires a video event and waits for what follows from it. */
	const fire = async (name: string) => {
		for (const fn of videoListeners.get(name) ?? []) fn();
		await settle();
	};
	return { windowListeners, timers, started, video, settle, fire, root };
}

describe('holdForFirstFrame', () => {
	it('leaves a page without SvelteKit’s start-up as it was', () => {
		const html = '<html lang="en"><body><p>No scripts here</p></body></html>';
		expect(holdForFirstFrame(html)).toBe(html);
		const changed = KIT_PAGE.replace(']).then(([kit, app]) => {', ']).then((modules) => {');
		expect(holdForFirstFrame(changed)).toBe(changed);
		// Nor is the typeface held then: nothing would let it go.
		expect(holdForFirstFrame(changed)).not.toContain(FONTS_HELD);
	});

	it('keeps everything else of the page, nonce included', () => {
		const held = holdForFirstFrame(KIT_PAGE);
		expect(held).toContain('<script nonce="abc">');
		expect(held).toContain('import("./_app/immutable/entry/start.js")');
		expect(held).toContain('kit.start(app, element, { node_ids: [0, 2] });');
	});

	it('a clip not playing: the app and the typeface start once its index is in', async () => {
		const state = { ...idle(), paused: true };
		const page = boot(holdForFirstFrame(KIT_PAGE), state);
		await page.settle();
		expect(page.started).toEqual([]);
		expect(page.root.held).toBe(true);
		// preload="metadata" may stop there: no first frame is waited for.
		state.readyState = 1;
		await page.fire('loadedmetadata');
		expect(page.started).toEqual(['started']);
		expect(page.root.held).toBe(false);
	});

	it(`a playing clip keeps the link until it has ${SECONDS_IN_HAND} s in hand`, async () => {
		const state = idle();
		const page = boot(holdForFirstFrame(KIT_PAGE), state);
		state.readyState = 3;
		state.ranges = [[0, 1.5]];
		await page.fire('loadeddata');
		state.currentTime = 1;
		state.ranges = [[0, 3.9]];
		await page.fire('progress');
		expect(page.started).toEqual([]);
		// A range elsewhere (after a seek) is not in hand.
		state.ranges = [
			[0, 3.9],
			[10, 20]
		];
		await page.fire('progress');
		expect(page.started).toEqual([]);
		state.ranges = [[0, 1 + SECONDS_IN_HAND]];
		await page.fire('timeupdate');
		expect(page.started).toEqual(['started']);
	});

	it('a short clip wholly in hand is enough, and so is a pause', async () => {
		const whole = idle();
		whole.duration = 2;
		const short = boot(holdForFirstFrame(KIT_PAGE), whole);
		whole.readyState = 4;
		whole.ranges = [[0, 2]];
		await short.fire('progress');
		expect(short.started).toEqual(['started']);

		const state = idle();
		const paused = boot(holdForFirstFrame(KIT_PAGE), state);
		state.readyState = 3;
		state.ranges = [[0, 1]];
		await paused.fire('progress');
		expect(paused.started).toEqual([]);
		state.paused = true;
		await paused.fire('pause');
		expect(paused.started).toEqual(['started']);
	});

	it('starts the app when the video fails, at the time limit, or when the patient reaches past the video', async () => {
		const broken = idle();
		const failed = boot(holdForFirstFrame(KIT_PAGE), broken);
		broken.error = { code: 4 };
		await failed.fire('error');
		expect(failed.started).toEqual(['started']);

		// The clip's <source> fails: its error reaches the video only on the way down.
		const noSource = idle();
		const sourceFailed = boot(holdForFirstFrame(KIT_PAGE), noSource);
		noSource.networkState = 3;
		await sourceFailed.fire('error');
		expect(sourceFailed.started).toEqual(['started']);

		const late = boot(holdForFirstFrame(KIT_PAGE), idle());
		expect(late.timers).toHaveLength(1);
		late.timers[0]();
		await late.settle();
		expect(late.started).toEqual(['started']);

		const touched = boot(holdForFirstFrame(KIT_PAGE), idle());
		// A tap on the video itself (the browser's own Play) keeps the link for the clip.
		touched.windowListeners.get('pointerdown')!({ target: touched.video });
		await touched.settle();
		expect(touched.started).toEqual([]);
		touched.windowListeners.get('pointerdown')!({ target: {} });
		await touched.settle();
		expect(touched.started).toEqual(['started']);

		const keyed = boot(holdForFirstFrame(KIT_PAGE), idle());
		keyed.windowListeners.get('keydown')!();
		await keyed.settle();
		expect(keyed.started).toEqual(['started']);
	});

	it('does not wait when there is nothing to wait for', async () => {
		const ready = { ...idle(), readyState: 1, paused: true };
		const failed = { ...idle(), error: { code: 4 } };
		for (const video of [null, ready, failed]) {
			const page = boot(holdForFirstFrame(KIT_PAGE), video);
			await page.settle();
			expect(page.started).toEqual(['started']);
		}
	});

	it('the untouched start-up runs at once (the stand-in document is sound)', async () => {
		const page = boot(KIT_PAGE, idle());
		await page.settle();
		expect(page.started).toEqual(['started']);
	});
});
