import { describe, expect, it } from 'vitest';
import { clipTime, keyBelongsToTarget, PLAYBACK_SPEEDS, shortcutFor } from './replay';

const element = (tagName: string, role: string | null = null) => ({
	tagName,
	isContentEditable: false,
	getAttribute: (name: string) => (name === 'role' ? role : null)
});

describe('replay keys', () => {
	it('map the keys the screen lists to their actions', () => {
		expect(shortcutFor(' ')).toBe('play');
		expect(shortcutFor('L')).toBe('loop');
		expect(shortcutFor('c')).toBe('captions');
		expect(['1', '2', '3'].map(shortcutFor)).toEqual(['speed-1', 'speed-2', 'speed-3']);
		// "+" needs Shift on many keyboards; "=" is the same key without it.
		expect(['r', 'R', '+', '='].map(shortcutFor)).toEqual(['rep', 'rep', 'rep', 'rep']);
		expect(shortcutFor('-')).toBe('unrep');
		expect(shortcutFor('s')).toBe('set');
		expect(shortcutFor('D')).toBe('done');
		expect(shortcutFor('x')).toBeNull();
		expect(shortcutFor('Enter')).toBeNull();
	});

	it('give way to fields, and Space to a focused button or link', () => {
		expect(keyBelongsToTarget('r', element('TEXTAREA'))).toBe(true);
		expect(keyBelongsToTarget('3', element('INPUT'))).toBe(true);
		expect(keyBelongsToTarget(' ', element('BUTTON'))).toBe(true);
		expect(keyBelongsToTarget(' ', element('DIV', 'button'))).toBe(true);
		expect(keyBelongsToTarget(' ', element('A'))).toBe(true);
		// Letters still count reps while a button has focus (one hand, no hunting for focus).
		expect(keyBelongsToTarget('r', element('BUTTON'))).toBe(false);
		expect(keyBelongsToTarget(' ', element('BODY'))).toBe(false);
		expect(keyBelongsToTarget(' ', null)).toBe(false);
		expect(keyBelongsToTarget('r', { ...element('DIV'), isContentEditable: true })).toBe(true);
	});

	it('offer half, three-quarter and normal speed (MAUR: adjustable rate with a reset to 100%)', () => {
		expect(PLAYBACK_SPEEDS.map((s) => s.rate)).toEqual([0.5, 0.75, 1]);
	});

	it('write clip times as minutes and seconds', () => {
		expect(clipTime(0)).toBe('0:00');
		expect(clipTime(7.9)).toBe('0:07');
		expect(clipTime(65)).toBe('1:05');
		expect(clipTime(Number.NaN)).toBe('0:00');
	});
});
