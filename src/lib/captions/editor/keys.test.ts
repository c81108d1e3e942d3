import { describe, expect, it } from 'vitest';
import { commandFor, KEY_HELP, type KeyLike } from './keys';

const press = (key: string, extra: Partial<KeyLike> = {}): KeyLike => ({
	key,
	code: '',
	altKey: false,
	ctrlKey: false,
	metaKey: false,
	shiftKey: false,
	...extra
});

describe('commandFor', () => {
	it('answers plain keys away from text fields', () => {
		expect(commandFor(press(' '), 'other')).toBe('play-pause');
		expect(commandFor(press('K', { shiftKey: true }), 'other')).toBe('play-pause');
		expect(commandFor(press('['), 'other')).toBe('mark-start');
		expect(commandFor(press(']'), 'other')).toBe('mark-end');
		expect(commandFor(press('<', { shiftKey: true }), 'other')).toBe('frame-back');
		expect(commandFor(press('ArrowRight', { shiftKey: true }), 'other')).toBe('step-forward');
		expect(commandFor(press('Enter'), 'other')).toBe('edit-text');
	});

	it('leaves plain keys to a text field, so typing types', () => {
		for (const key of [' ', 'k', 'n', 's', '[', ',', 'Enter', 'Backspace', 'ArrowUp']) {
			expect(commandFor(press(key), 'text')).toBeNull();
		}
	});

	it('leaves Space and Enter to a focused button, which they press', () => {
		expect(commandFor(press(' '), 'control')).toBeNull();
		expect(commandFor(press('Enter'), 'control')).toBeNull();
		expect(commandFor(press('n'), 'control')).toBe('new-cue');
	});

	it('answers Alt combinations everywhere, by the key’s place on the keyboard', () => {
		// Alt+] types ‘ on some layouts; the code stays BracketRight.
		expect(commandFor(press('‘', { altKey: true, code: 'BracketRight' }), 'text')).toBe('mark-end');
		expect(commandFor(press('k', { altKey: true, code: 'KeyK' }), 'text')).toBe('play-pause');
		expect(commandFor(press('<', { altKey: true, shiftKey: true, code: 'Comma' }), 'text')).toBe(
			'frame-back'
		);
		expect(commandFor(press('x', { altKey: true, code: 'KeyX' }), 'text')).toBeNull();
	});

	it('answers Ctrl (or Cmd) for undo, redo and save, even while typing', () => {
		expect(commandFor(press('z', { ctrlKey: true }), 'text')).toBe('undo');
		expect(commandFor(press('Z', { ctrlKey: true, shiftKey: true }), 'text')).toBe('redo');
		expect(commandFor(press('y', { ctrlKey: true }), 'other')).toBe('redo');
		expect(commandFor(press('s', { metaKey: true }), 'text')).toBe('save');
		expect(commandFor(press('c', { ctrlKey: true }), 'text')).toBeNull();
	});

	it('documents every command it answers', () => {
		expect(KEY_HELP.length).toBeGreaterThanOrEqual(17);
		expect(KEY_HELP.every((row) => row.keys.length > 0 && row.does.length > 0)).toBe(true);
	});
});
