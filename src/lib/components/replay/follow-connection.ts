import {
	bufferedThroughput,
	chooseVersion,
	nextVersion,
	type PlayerVersion
} from '$lib/media/ladder';

/** The Network Information API where the browser has it (Chromium, Android). */
interface Connection extends EventTarget {
	downlink?: number;
	saveData?: boolean;
}

const CHECK_MS = 2000;
/** After stepping down, this long before stepping up again: the link just failed that version. */
const HOLD_AFTER_STALL_MS = 20_000;

function connection(): Connection | null {
	return (navigator as Navigator & { connection?: Connection }).connection ?? null;
}

/** Throughput the browser reports, kbit/s (Chromium rounds and caps it at 10 Mbit/s). */
function reportedKbps(): number | null {
	const downlink = connection()?.downlink;
	return typeof downlink === 'number' && downlink > 0 ? downlink * 1000 : null;
}

function bufferedEnd(video: HTMLVideoElement): number {
	const t = video.currentTime;
	for (let i = 0; i < video.buffered.length; i++) {
		if (video.buffered.start(i) <= t + 0.1 && t <= video.buffered.end(i)) {
			return video.buffered.end(i);
		}
	}
	return t;
}

/**
 * Plays the version of the clip the connection can carry and steps up or down as it goes
 * (src/lib/media/ladder.ts). The page's markup starts the smallest version, so its first bytes
 * go out with the page; once the script runs it moves to the version the browser's reported
 * throughput carries (Network Information API), or, without one, to what the buffering rate of
 * the version playing shows. A stall of a second steps down one at once (and holds there a
 * while); stepping up waits for a pause or the loop's restart, so it never interrupts a movement.
 * Changing version keeps the place, speed and playing state. Returns a function that stops.
 */
export function followConnection(
	video: HTMLVideoElement,
	versions: readonly PlayerVersion[],
	onchange?: (version: PlayerVersion) => void
): () => void {
	if (versions.length < 2) return () => {};
	const playingSrc = () => new URL(video.currentSrc || versions[0].src, location.href).href;
	let current = Math.max(
		0,
		versions.findIndex((v) => new URL(v.src, location.href).href === playingSrc())
	);
	let pendingUp: number | null = null;
	let holdUntil = 0;
	let stalledSince: number | null = null;
	let stalledMs = 0;
	let lastEnd = bufferedEnd(video);
	let lastAt = performance.now();
	let lastTime = video.currentTime;

	function switchTo(index: number) {
		if (index === current) return;
		const at = video.currentTime;
		const wasPlaying = !video.paused;
		const rate = video.playbackRate;
		current = index;
		pendingUp = null;
		stalledSince = null;
		stalledMs = 0;
		video.addEventListener(
			'loadedmetadata',
			() => {
				if (at > 0) video.currentTime = at;
				video.playbackRate = rate;
				if (wasPlaying) void video.play().catch(() => {});
			},
			{ once: true }
		);
		video.src = versions[index].src;
		lastEnd = 0;
		lastAt = performance.now();
		onchange?.(versions[index]);
	}

	// Not playing yet: change at once. Already playing (Play pressed before the script ran):
	// the small version's first frames are on screen, so the change waits for the loop.
	const first = chooseVersion(versions, reportedKbps(), Boolean(connection()?.saveData));
	if (first > current && video.paused) switchTo(first);
	else if (first > current) pendingUp = first;

	const onWaiting = () => {
		if (!video.paused && stalledSince === null) stalledSince = performance.now();
	};
	const onFlowing = () => {
		if (stalledSince !== null) stalledMs += performance.now() - stalledSince;
		stalledSince = null;
	};
	const onTime = () => {
		// The loop started over (or the patient went back): a moment where a change is not seen.
		const wrapped = video.currentTime + 0.5 < lastTime;
		lastTime = video.currentTime;
		if (wrapped && pendingUp !== null) switchTo(pendingUp);
	};
	const onPause = () => {
		if (pendingUp !== null) switchTo(pendingUp);
	};

	const timer = setInterval(() => {
		const now = performance.now();
		const end = bufferedEnd(video);
		const grown = end - lastEnd;
		const measured =
			grown > 0 && !(end >= video.duration - 0.05)
				? bufferedThroughput(grown, (now - lastAt) / 1000, versions[current].kbps)
				: null;
		lastEnd = end;
		lastAt = now;
		const stalledSeconds = (stalledMs + (stalledSince !== null ? now - stalledSince : 0)) / 1000;
		stalledMs = 0;
		if (stalledSince !== null) stalledSince = now;
		const next = nextVersion(versions, current, {
			throughputKbps: reportedKbps() ?? measured,
			stalledSeconds,
			saveData: Boolean(connection()?.saveData)
		});
		if (next < current) {
			holdUntil = now + HOLD_AFTER_STALL_MS;
			switchTo(next);
		} else if (next > current && now >= holdUntil) {
			if (video.paused) switchTo(next);
			else pendingUp = Math.max(pendingUp ?? 0, next);
		}
	}, CHECK_MS);

	video.addEventListener('waiting', onWaiting);
	video.addEventListener('playing', onFlowing);
	video.addEventListener('canplay', onFlowing);
	video.addEventListener('timeupdate', onTime);
	video.addEventListener('pause', onPause);
	return () => {
		clearInterval(timer);
		video.removeEventListener('waiting', onWaiting);
		video.removeEventListener('playing', onFlowing);
		video.removeEventListener('canplay', onFlowing);
		video.removeEventListener('timeupdate', onTime);
		video.removeEventListener('pause', onPause);
	};
}
