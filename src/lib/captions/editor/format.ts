/** How the studio writes times, counts and the length of a frame for people to read. */
import { formatTimestamp } from '$lib/captions/timestamp';

/** A time on the recording as the studio shows it: 01:02.500, with hours only when there are any. */
export function cueTime(seconds: number): string {
	return formatTimestamp(Math.max(0, seconds), { hours: 'auto' });
}

/** "1 cue", "3 cues"; `many` for words whose plural is not the word and an s. */
export function plural(n: number, one: string, many = `${one}s`): string {
	return `${n} ${n === 1 ? one : many}`;
}

/** One frame of the recording in words ("1/25 s"), saying so when its frame rate is not known. */
export function frameWords(frameRate: number | null): string {
	return frameRate && frameRate > 0
		? `1/${Math.round(frameRate * 100) / 100} s`
		: '1/25 s (the recording’s frame rate is not known)';
}
