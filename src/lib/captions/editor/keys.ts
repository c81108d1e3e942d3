/**
 * The studio's keyboard. Plain keys work whenever the focus is not in a text field; the same
 * keys with Alt also work while typing, so a clinician can mark times without leaving a cue's
 * words. Alt combinations are matched by the key's place on the keyboard (`code`), because Alt
 * changes the character some layouts type.
 */

export type Command =
	| 'play-pause'
	| 'mark-start'
	| 'mark-end'
	| 'new-cue'
	| 'split'
	| 'merge'
	| 'nudge-back'
	| 'nudge-forward'
	| 'frame-back'
	| 'frame-forward'
	| 'switch-edge'
	| 'previous-cue'
	| 'next-cue'
	| 'seek-back'
	| 'seek-forward'
	| 'step-back'
	| 'step-forward'
	| 'edit-text'
	| 'delete-cue'
	| 'undo'
	| 'redo'
	| 'save'
	| 'zoom-in'
	| 'zoom-out'
	| 'help';

export interface KeyLike {
	key: string;
	code: string;
	altKey: boolean;
	ctrlKey: boolean;
	metaKey: boolean;
	shiftKey: boolean;
}

/** Where the focus is: a text field, a control that Space and Enter press, or anywhere else. */
export type Focus = 'text' | 'control' | 'other';

const PLAIN: Record<string, Command> = {
	' ': 'play-pause',
	k: 'play-pause',
	'[': 'mark-start',
	']': 'mark-end',
	n: 'new-cue',
	s: 'split',
	m: 'merge',
	',': 'nudge-back',
	'.': 'nudge-forward',
	'<': 'frame-back',
	'>': 'frame-forward',
	e: 'switch-edge',
	ArrowUp: 'previous-cue',
	ArrowDown: 'next-cue',
	ArrowLeft: 'seek-back',
	ArrowRight: 'seek-forward',
	Enter: 'edit-text',
	Delete: 'delete-cue',
	Backspace: 'delete-cue',
	'+': 'zoom-in',
	'=': 'zoom-in',
	'-': 'zoom-out',
	'?': 'help'
};

const WITH_ALT: Record<string, Command> = {
	KeyK: 'play-pause',
	BracketLeft: 'mark-start',
	BracketRight: 'mark-end',
	KeyN: 'new-cue',
	KeyS: 'split',
	KeyM: 'merge',
	Comma: 'nudge-back',
	Period: 'nudge-forward',
	KeyE: 'switch-edge',
	ArrowUp: 'previous-cue',
	ArrowDown: 'next-cue'
};

/** The command a key press asks for where the focus is, or null to leave the key alone. */
export function commandFor(k: KeyLike, focus: Focus): Command | null {
	const control = k.ctrlKey || k.metaKey;
	if (control) {
		if (k.altKey) return null;
		const key = k.key.toLowerCase();
		if (key === 'z') return k.shiftKey ? 'redo' : 'undo';
		if (key === 'y' && !k.shiftKey) return 'redo';
		if (key === 's' && !k.shiftKey) return 'save';
		return null;
	}
	if (k.altKey) {
		if (k.shiftKey && k.code === 'Comma') return 'frame-back';
		if (k.shiftKey && k.code === 'Period') return 'frame-forward';
		return k.shiftKey ? null : (WITH_ALT[k.code] ?? null);
	}
	if (focus === 'text') return null;
	if (focus === 'control' && (k.key === ' ' || k.key === 'Enter')) return null;
	const key = k.key.length === 1 ? k.key.toLowerCase() : k.key;
	if (k.shiftKey && (key === 'ArrowLeft' || key === 'ArrowRight')) {
		return key === 'ArrowLeft' ? 'step-back' : 'step-forward';
	}
	return PLAIN[key] ?? null;
}

/** Where an element puts the focus, for commandFor. */
export function focusKind(target: EventTarget | null): Focus {
	if (!(target instanceof Element)) return 'other';
	if (target instanceof HTMLTextAreaElement || target instanceof HTMLSelectElement) return 'text';
	if (target instanceof HTMLInputElement) {
		return ['button', 'submit', 'reset', 'checkbox', 'radio'].includes(target.type)
			? 'control'
			: 'text';
	}
	if ((target as HTMLElement).isContentEditable) return 'text';
	if (target.closest('button, a[href], summary, [role="button"]')) return 'control';
	return 'other';
}

/** The keyboard help, in the order it is shown; `alt` says the key also works with Alt while typing. */
export const KEY_HELP: { keys: string[]; does: string; alt?: boolean }[] = [
	{ keys: ['Space', 'K'], does: 'Play or pause', alt: true },
	{
		keys: ['['],
		does: 'Mark start: a new cue begins at the playhead (or the cue on screen starts there)',
		alt: true
	},
	{ keys: [']'], does: 'Mark end: the selected cue ends at the playhead', alt: true },
	{ keys: ['N'], does: 'New cue at the playhead, ready to type its words', alt: true },
	{
		keys: ['Enter'],
		does: 'Type the selected cue’s words; Enter again keeps them and comes back here'
	},
	{ keys: ['S'], does: 'Split the cue at the playhead in two', alt: true },
	{ keys: ['M'], does: 'Join the selected cue with the next one', alt: true },
	{ keys: ['E'], does: 'Switch the edge that nudges move: start or end', alt: true },
	{ keys: [',', '.'], does: 'Move the selected edge 0.1 s earlier or later', alt: true },
	{ keys: ['<', '>'], does: 'Move the selected edge one frame earlier or later', alt: true },
	{ keys: ['↑', '↓'], does: 'Previous or next cue (the playhead goes to its start)', alt: true },
	{ keys: ['←', '→'], does: 'Playhead 1 s back or forward; with Shift, one frame' },
	{ keys: ['Delete'], does: 'Remove the selected cue' },
	{ keys: ['+', '−'], does: 'Zoom the timeline in or out' },
	{ keys: ['Ctrl+Z'], does: 'Undo' },
	{ keys: ['Ctrl+Shift+Z', 'Ctrl+Y'], does: 'Redo' },
	{ keys: ['Ctrl+S'], does: 'Save now' },
	{ keys: ['?'], does: 'Show or hide this list' }
];
