/** Shapes and words shared by the replay screen's parts (player, transcript, keyboard). */

/** One line of the transcript: a cue of the segment's captions as plain words. */
export interface TranscriptLine {
	id: string;
	start: number;
	end: number;
	text: string;
}

/** The speeds offered, slowest first; keys 1, 2 and 3 choose them. */
export const PLAYBACK_SPEEDS = [
	{ rate: 0.5, label: '0.5×', words: 'half speed' },
	{ rate: 0.75, label: '0.75×', words: 'three-quarter speed' },
	{ rate: 1, label: '1×', words: 'normal speed' }
] as const;

/** Seconds as a patient reads a clip's time: "0:07", "1:05". */
export function clipTime(seconds: number): string {
	const whole = Number.isFinite(seconds) ? Math.max(0, Math.floor(seconds)) : 0;
	return `${Math.floor(whole / 60)}:${String(whole % 60).padStart(2, '0')}`;
}

export type ShortcutAction =
	| 'play'
	| 'loop'
	| 'captions'
	| 'speed-1'
	| 'speed-2'
	| 'speed-3'
	| 'rep'
	| 'unrep'
	| 'set'
	| 'done';

/** What a key does on the replay screen; null for keys we leave alone. */
export function shortcutFor(key: string): ShortcutAction | null {
	switch (key) {
		case ' ':
		case 'Spacebar':
			return 'play';
		case 'l':
		case 'L':
			return 'loop';
		case 'c':
		case 'C':
			return 'captions';
		case '1':
			return 'speed-1';
		case '2':
			return 'speed-2';
		case '3':
			return 'speed-3';
		case '+':
		case '=':
		case 'r':
		case 'R':
			return 'rep';
		case '-':
		case '−':
			return 'unrep';
		case 's':
		case 'S':
			return 'set';
		case 'd':
		case 'D':
			return 'done';
		default:
			return null;
	}
}

interface KeyTarget {
	tagName?: string;
	isContentEditable?: boolean;
	getAttribute?: (name: string) => string | null;
}

/**
 * Whether a shortcut should give way to what has focus: typing in a field (the note, the pain
 * choice), or Space on a button or link, which presses that control instead.
 */
export function keyBelongsToTarget(key: string, target: KeyTarget | null): boolean {
	if (!target) return false;
	const tag = target.tagName?.toUpperCase() ?? '';
	if (tag === 'INPUT' || tag === 'TEXTAREA' || tag === 'SELECT' || target.isContentEditable) {
		return true;
	}
	const role = target.getAttribute?.('role');
	const pressable = tag === 'BUTTON' || tag === 'A' || tag === 'SUMMARY' || role === 'button';
	return pressable && (key === ' ' || key === 'Spacebar' || key === 'Enter');
}
