/**
 * On a patient's replay the clip goes before the page's scripts. On a slow phone link every byte
 * before the first frame delays it, and a playing clip with little in hand stalls while the
 * scripts (about 60 KiB) and the typeface (about 34 KiB) arrive; none of them is needed to play:
 * the player works with the browser's own controls and captions until the scripts start. So the
 * page's start-up waits until the video has its index (not playing) or its first frame and some
 * seconds in hand, or all of it (playing); or until it fails or is not there; or until the patient touches
 * anything but the video or presses a key (they may want what the scripts do); and at most
 * SCRIPT_HOLD_MS. Meanwhile the text is drawn in the device's own typeface
 * (`html[data-fonts-held]` in app.css). Measured in `npm run bench:network`.
 *
 * It rewrites SvelteKit's inline start-up (`Promise.all([import(start), import(app)]).then(…)`),
 * found by its exact text: when a SvelteKit upgrade changes that text the page is left as it was
 * (nothing breaks; the replay e2e test that checks the order then fails, so it is noticed).
 */

/** Longest the scripts wait. */
export const SCRIPT_HOLD_MS = 30_000;
/** Seconds of a playing clip in hand before the scripts may share the link. */
export const SECONDS_IN_HAND = 10;

const BOOT_START = 'Promise.all([';
const BOOT_THEN = ']).then(([kit, app]) => {';

// Runs inside SvelteKit's own start-up script (so under its CSP nonce), at the end of <body>:
// the player is already in the document.
const CLIP_FIRST = `new Promise((go) => {
	const video = document.querySelector('main video');
	if (!video) return go();
	const inHand = () => {
		const { buffered, currentTime, duration } = video;
		for (let i = 0; i < buffered.length; i++) {
			if (buffered.start(i) <= currentTime + 0.1 && buffered.end(i) >= currentTime) {
				return buffered.end(i) >= duration - 0.1 ? Infinity : buffered.end(i) - currentTime;
			}
		}
		return 0;
	};
	const check = () => {
		// A failed <source> leaves video.error empty and says so in networkState (NETWORK_NO_SOURCE).
		if (video.error || video.networkState === 3) return go();
		// Not asked to play: the poster stands in, and the browser fetches no more than the clip's
		// index (preload="metadata"), so the scripts wait only for that.
		if (video.paused) {
			if (video.readyState >= 1) go();
			return;
		}
		if (video.readyState >= 2 && inHand() >= ${SECONDS_IN_HAND}) go();
	};
	for (const name of ['loadedmetadata', 'loadeddata', 'progress', 'timeupdate', 'pause']) {
		video.addEventListener(name, check);
	}
	// A <source>'s error does not bubble: caught on its way down.
	video.addEventListener('error', check, true);
	addEventListener('pointerdown', (event) => { if (event.target !== video) go(); });
	addEventListener('keydown', go, { once: true });
	setTimeout(go, ${SCRIPT_HOLD_MS});
	check();
})`;

export const FONTS_HELD = 'data-fonts-held';
const HTML_TAG = /<html(?=[\s>])/;

/**
 * The page's HTML with its start-up and typeface held for the clip (unchanged if SvelteKit's
 * start-up is not found).
 */
export function holdForFirstFrame(html: string): string {
	const start = html.indexOf(BOOT_START);
	const then = html.indexOf(BOOT_THEN, start);
	if (start < 0 || then < 0 || !HTML_TAG.test(html)) return html;
	const withFontsHeld = html.slice(0, start).replace(HTML_TAG, `<html ${FONTS_HELD}`);
	return (
		withFontsHeld +
		`${CLIP_FIRST}.then(() => (document.documentElement.removeAttribute('${FONTS_HELD}'), ${BOOT_START}` +
		html.slice(start + BOOT_START.length, then) +
		`]))${BOOT_THEN.slice(1)}` +
		html.slice(then + BOOT_THEN.length)
	);
}
