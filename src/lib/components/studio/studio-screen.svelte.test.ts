import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import type { Cue } from '$lib/captions/types';
import type { Focus } from '$lib/captions/editor/keys';
import type { Draft } from './drafts';
import {
	StudioScreen,
	type KeyPress,
	type Player,
	type StudioSource,
	type StudioView
} from './studio-screen.svelte';

// The device's copy lives in IndexedDB, which Node has not: a map stands in for it.
const kept = vi.hoisted(() => new Map<string, Draft>());
vi.mock('./drafts', () => ({
	keepDraft: async (draft: Draft) => void kept.set(`${draft.trackId}:${draft.baseVersion}`, draft),
	findDrafts: async (trackId: string) =>
		[...kept.values()]
			.filter((d) => d.trackId === trackId)
			.sort((a, b) => b.updatedAt - a.updatedAt),
	dropDrafts: async (trackId: string, baseVersion?: number) => {
		for (const [key, d] of kept) {
			if (d.trackId === trackId && (baseVersion === undefined || d.baseVersion === baseVersion))
				kept.delete(key);
		}
	}
}));

const cue = (id: string, start: number, end: number, text: string): Cue => ({
	id,
	start,
	end,
	text
});

const CUES = [cue('a', 1, 3, 'Lie on your back.'), cue('b', 5, 8, 'Slide your heel up.')];

function source(changes: Partial<StudioSource['recording']> = {}, cues = CUES): StudioSource {
	return {
		recording: {
			id: 'rec-1',
			durationSeconds: 20,
			frameRate: 25,
			sprite: null,
			hasWaveform: false,
			posterCount: 1,
			...changes
		},
		track: {
			id: 'track-1',
			label: 'English',
			language: 'en-GB',
			kind: 'captions',
			version: 4,
			cues
		},
		clinicProfile: 'bbc'
	};
}

/** A video element's part the screen uses, standing still at `time`. */
function player(time = 0): Player & { playCalls: number; pauseCalls: number } {
	return {
		currentTime: time,
		paused: true,
		seeking: false,
		playCalls: 0,
		pauseCalls: 0,
		async play() {
			this.playCalls++;
		},
		pause() {
			this.pauseCalls++;
		}
	};
}

/** Records what the screen asked of its sections. */
function view(): StudioView & { asked: string[] } {
	const asked: string[] = [];
	return {
		asked,
		focusText: (key) => void asked.push(`text ${key}`),
		focusRow: (key, reveal) => void asked.push(`row ${key}${reveal ? ' revealed' : ''}`),
		zoomIn: () => void asked.push('zoom in'),
		zoomOut: () => void asked.push('zoom out'),
		revealHelp: () => void asked.push('help')
	};
}

function screenAt(time = 0, from = source()) {
	const screen = new StudioScreen(() => from);
	const v = view();
	screen.view = v;
	screen.player = player(time);
	return { screen, view: v, player: screen.player as ReturnType<typeof player> };
}

/** A keydown as the window would hand it over. */
function press(key: string, extra: Partial<KeyPress> = {}): KeyPress & { prevented: boolean } {
	return {
		key,
		code: '',
		altKey: false,
		ctrlKey: false,
		metaKey: false,
		shiftKey: false,
		repeat: false,
		isComposing: false,
		defaultPrevented: false,
		target: null,
		prevented: false,
		preventDefault() {
			this.prevented = true;
		},
		...extra
	};
}

const answer = (status: number, body: unknown) =>
	new Response(JSON.stringify(body), {
		status,
		headers: { 'Content-Type': 'application/json' }
	});

/** Lets the promises already under way settle (the draft look-up, a save). */
const settle = () => new Promise((resolve) => setTimeout(resolve, 0));

beforeEach(() => kept.clear());
afterEach(() => {
	vi.unstubAllGlobals();
	vi.useRealTimers();
});

describe('the studio screen opening', () => {
	it('holds editing while it looks for changes kept on this device, then is ready', async () => {
		const { screen } = screenAt();
		const close = screen.open();
		expect(screen.studio.locked).toBe(true);
		expect(screen.ready).toBe(false);
		await settle();
		expect(screen.ready).toBe(true);
		expect(screen.offer).toBeNull();
		expect(screen.studio.locked).toBe(false);
		close();
	});

	it('offers kept changes; editing waits for the answer, and Restore puts them in as unsaved', async () => {
		kept.set('track-1:4', {
			trackId: 'track-1',
			baseVersion: 4,
			cues: [cue('a', 1, 3, 'Lie flat on your back.'), cue('b', 5, 8, 'Slide your heel up.')],
			updatedAt: 1
		});
		const { screen } = screenAt();
		const close = screen.open();
		await settle();
		expect(screen.ready).toBe(true);
		expect(screen.offer?.cues[0].text).toBe('Lie flat on your back.');
		expect(screen.studio.locked).toBe(true);
		screen.onKey(press('n'), 'other');
		expect(screen.studio.cues).toHaveLength(2);
		expect(screen.studio.note).toMatch(/restore/);

		screen.restoreDraft();
		expect(screen.offer).toBeNull();
		expect(screen.studio.locked).toBe(false);
		expect(screen.studio.cues[0].text).toBe('Lie flat on your back.');
		expect(screen.studio.note).toBe('Restored the 2 cues kept on this device.');
		expect(screen.autosave.state).toBe('waiting');
		// Undo goes back to the saved version's cues.
		screen.studio.undo();
		expect(screen.studio.cues[0].text).toBe('Lie on your back.');
		screen.autosave.stop();
		close();
	});

	it('discards kept changes when asked, and the cues stay as saved', async () => {
		kept.set('track-1:3', {
			trackId: 'track-1',
			baseVersion: 3,
			cues: [cue('a', 1, 3, 'Old words.')],
			updatedAt: 1
		});
		const { screen } = screenAt();
		screen.open();
		await settle();
		expect(screen.offer?.baseVersion).toBe(3);
		screen.discardDraft();
		await screen.autosave.settled();
		expect(kept.size).toBe(0);
		expect(screen.offer).toBeNull();
		expect(screen.studio.locked).toBe(false);
		expect(screen.studio.cues.map((c) => c.text)).toEqual(CUES.map((c) => c.text));
		expect(screen.studio.note).toBe('Discarded the changes kept on this device.');
	});

	it('loads the waveform when the recording has one, and does without it when it fails', async () => {
		const fetch = vi.fn(async () => answer(200, { peaksPerSecond: 20, peaks: [0.1, 0.4] }));
		vi.stubGlobal('fetch', fetch);
		const { screen } = screenAt(0, source({ hasWaveform: true }));
		screen.open();
		await settle();
		expect(fetch).toHaveBeenCalledWith('/api/recordings/rec-1/media/waveform.json');
		expect(screen.waveform).toEqual({ peaksPerSecond: 20, peaks: [0.1, 0.4] });

		fetch.mockImplementation(async () => answer(404, {}));
		const other = screenAt(0, source({ hasWaveform: true })).screen;
		other.open();
		await settle();
		expect(other.waveform).toBeNull();

		fetch.mockClear();
		screenAt().screen.open();
		await settle();
		expect(fetch).not.toHaveBeenCalled();
	});

	it('saves a failed save again when the device is back online, and sends waiting changes on leaving', async () => {
		const listeners = new Map<string, () => void>();
		vi.stubGlobal('addEventListener', (type: string, f: () => void) => listeners.set(type, f));
		vi.stubGlobal('removeEventListener', (type: string) => listeners.delete(type));
		const fetch = vi.fn<typeof globalThis.fetch>(async () => {
			throw new TypeError('offline');
		});
		vi.stubGlobal('fetch', fetch);
		vi.useFakeTimers();
		const { screen } = screenAt(2);
		const close = screen.open();
		await vi.advanceTimersByTimeAsync(0);

		screen.onKey(press('s', { ctrlKey: true }), 'other');
		await vi.advanceTimersByTimeAsync(0);
		// Nothing changed yet: nothing to send.
		expect(fetch).not.toHaveBeenCalled();
		screen.studio.setText(screen.studio.cues[0].key, 'Lie still.');
		screen.onKey(press('s', { ctrlKey: true }), 'other');
		await vi.advanceTimersByTimeAsync(0);
		expect(fetch).toHaveBeenCalledTimes(1);
		expect(screen.autosave.state).toBe('failed');

		fetch.mockImplementation(async () => answer(201, { version: 5 }));
		listeners.get('online')?.();
		await vi.advanceTimersByTimeAsync(0);
		expect(fetch).toHaveBeenCalledTimes(2);
		expect(screen.autosave.words).toBe('Saved as version 5');

		// An edit waits for its pause; leaving sends it at once.
		screen.studio.setText(screen.studio.cues[0].key, 'Lie still, and breathe.');
		expect(screen.autosave.state).toBe('waiting');
		close();
		expect(listeners.has('online')).toBe(false);
		await vi.advanceTimersByTimeAsync(0);
		expect(fetch).toHaveBeenCalledTimes(3);
		expect(screen.autosave.words).toBe('Saved as version 5');
		expect(JSON.parse(String(fetch.mock.calls[2][1]?.body)).cues[0].text).toBe(
			'Lie still, and breathe.'
		);
	});
});

describe('the studio screen’s player', () => {
	it('seeks within the recording, moving the video and the playhead', () => {
		const { screen, player } = screenAt();
		screen.seek(25);
		expect(player.currentTime).toBe(20);
		expect(screen.studio.time).toBe(20);
		screen.seek(-3);
		expect(player.currentTime).toBe(0);
		screen.player = undefined;
		screen.seek(4);
		expect(screen.studio.time).toBe(4);
	});

	it('plays and pauses, and says when the video cannot play', async () => {
		const { screen, player } = screenAt();
		screen.togglePlay();
		expect(player.playCalls).toBe(1);
		screen.player = { ...player, paused: false, pause: () => void player.pauseCalls++ };
		screen.togglePlay();
		expect(player.pauseCalls).toBe(1);
		screen.player = { ...player, paused: true, play: () => Promise.reject(new Error('refused')) };
		screen.togglePlay();
		await settle();
		expect(screen.studio.note).toBe('The video could not play.');
	});

	it('follows the video’s time, except while it seeks or plays (the frames follow it then)', () => {
		const { screen, player } = screenAt();
		player.currentTime = 3;
		screen.timeUpdated();
		expect(screen.studio.time).toBe(3);
		screen.played();
		player.currentTime = 4;
		screen.timeUpdated();
		expect(screen.studio.time).toBe(3);
		screen.paused();
		expect(screen.playing).toBe(false);
		expect(screen.studio.time).toBe(4);
		screen.player = { ...player, currentTime: 9, seeking: true };
		screen.syncTime();
		expect(screen.studio.time).toBe(4);
	});

	it('goes to a finding’s cue: selected, the playhead at its start, its row in sight', () => {
		const { screen, view, player } = screenAt();
		screen.goToFinding(1);
		const second = screen.studio.cues[1];
		expect(screen.studio.selectedKey).toBe(second.key);
		expect(player.currentTime).toBe(5);
		expect(view.asked).toEqual([`row ${second.key} revealed`]);
		screen.goToFinding(7);
		expect(view.asked).toHaveLength(1);
	});
});

describe('the studio screen’s keys', () => {
	it('marks a cue at the video’s time, and leaves plain keys to a text field', () => {
		const { screen, player } = screenAt(10);
		const typed = press('[');
		screen.onKey(typed, 'text');
		expect(typed.prevented).toBe(false);
		expect(screen.studio.cues).toHaveLength(2);

		const mark = press('[');
		screen.onKey(mark, 'other');
		expect(mark.prevented).toBe(true);
		expect(screen.studio.cues.map((c) => c.start)).toEqual([1, 5, 10]);
		player.currentTime = 12;
		screen.onKey(press(']'), 'other');
		expect(screen.studio.cues[2]).toMatchObject({ start: 10, end: 12 });
	});

	it('lets the page and other handlers have a key first, and waits while a word is composed', () => {
		const { screen } = screenAt(10);
		for (const extra of [{ defaultPrevented: true }, { isComposing: true }]) {
			const key = press('n', extra);
			screen.onKey(key, 'other');
			expect(key.prevented).toBe(false);
		}
		expect(screen.studio.cues).toHaveLength(2);
	});

	it('repeats a held key only for the commands that move things bit by bit', () => {
		const { screen, view } = screenAt(10);
		screen.onKey(press('n'), 'other');
		const added = screen.studio.selectedKey!;
		expect(view.asked).toEqual([`text ${added}`]);
		expect(screen.studio.cues).toHaveLength(3);

		const start = screen.studio.selected!.start;
		screen.onKey(press(',', { repeat: true }), 'other');
		screen.onKey(press(',', { repeat: true }), 'other');
		expect(screen.studio.selected!.start).toBeCloseTo(start - 0.2);

		// Delete held down removes the selected cue only, not the ones after it.
		screen.studio.select(screen.studio.cues[0].key);
		screen.onKey(press('Delete'), 'other');
		expect(screen.studio.cues).toHaveLength(2);
		const held = press('Delete', { repeat: true });
		screen.onKey(held, 'other');
		expect(held.prevented).toBe(true);
		expect(screen.studio.cues).toHaveLength(2);
	});

	it('goes to the next cue’s words while typing, and to its row otherwise', () => {
		const { screen, view, player } = screenAt(0);
		const [first, second] = screen.studio.cues;
		screen.onKey(press('ArrowDown', { altKey: true, code: 'ArrowDown' }), 'text');
		expect(screen.studio.selectedKey).toBe(first.key);
		expect(player.currentTime).toBe(1);
		screen.onKey(press('ArrowDown'), 'other');
		expect(screen.studio.selectedKey).toBe(second.key);
		expect(player.currentTime).toBe(5);
		expect(view.asked).toEqual([`text ${first.key}`, `row ${second.key}`]);
	});

	it('nudges the chosen edge by a frame, and says which edge nudges move', () => {
		const { screen } = screenAt(0);
		screen.studio.select(screen.studio.cues[0].key);
		screen.onKey(press('e'), 'other');
		expect(screen.studio.note).toBe('Nudges now move the end.');
		screen.onKey(press('>', { shiftKey: true }), 'other');
		expect(screen.studio.cues[0].end).toBeCloseTo(3.04);
		screen.onKey(press('ArrowRight', { shiftKey: true }), 'other');
		expect(screen.studio.time).toBeCloseTo(0.04);
	});

	it('asks for a cue before Enter, and opens the words of the cue on screen without one', () => {
		const { screen, view } = screenAt(15);
		screen.onKey(press('Enter'), 'other');
		expect(screen.studio.note).toBe('Select a cue first, or press N for a new one.');
		screen.seek(6);
		screen.onKey(press('Enter'), 'other');
		expect(view.asked).toEqual([`text ${screen.studio.cues[1].key}`]);
	});

	it('zooms the timeline, undoes and redoes, and shows or hides the keys', async () => {
		const { screen, view } = screenAt(0);
		screen.onKey(press('+'), 'other');
		screen.onKey(press('-'), 'other');
		screen.studio.remove(screen.studio.cues[0].key);
		screen.onKey(press('z', { ctrlKey: true, repeat: true }), 'other');
		expect(screen.studio.cues).toHaveLength(2);
		screen.onKey(press('Z', { ctrlKey: true, shiftKey: true }), 'other');
		expect(screen.studio.cues).toHaveLength(1);

		expect(screen.showHelp).toBe(true);
		screen.onKey(press('?', { shiftKey: true }), 'other');
		expect(screen.showHelp).toBe(false);
		screen.onKey(press('?', { shiftKey: true }), 'other');
		expect(screen.showHelp).toBe(true);
		await settle();
		expect(view.asked).toEqual(['zoom in', 'zoom out', 'help']);
	});

	it('runs a button’s command with the focus where it is (the buttons keep it)', () => {
		const { screen, view } = screenAt(0);
		const focus: Focus = 'text';
		screen.run('next-cue', focus);
		expect(view.asked).toEqual([`text ${screen.studio.cues[0].key}`]);
		screen.run('play-pause');
		expect((screen.player as ReturnType<typeof player>).playCalls).toBe(1);
	});
});

describe('a save that meets a newer version', () => {
	async function conflicted() {
		const theirs = [
			cue('a', 1, 3, 'Lie on your back slowly.'),
			cue('b', 5, 8, 'Slide your heel up.')
		];
		const fetch = vi.fn<typeof globalThis.fetch>(async () =>
			answer(409, {
				error: { status: 409, message: 'Version 5 was saved meanwhile.' },
				conflict: {
					baseVersion: 4,
					yours: [],
					current: { version: 5, cues: theirs, note: '', createdAt: '2026-11-17T10:00:00Z' }
				}
			})
		);
		vi.stubGlobal('fetch', fetch);
		const { screen } = screenAt(0);
		screen.studio.setText(screen.studio.cues[1].key, 'Slide your heel up, slowly.');
		screen.run('save', 'other');
		await settle();
		expect(screen.autosave.state).toBe('conflict');
		return { screen, fetch };
	}

	it('shows theirs when asked, and Undo brings mine back', async () => {
		const { screen } = await conflicted();
		screen.takeTheirs();
		expect(screen.studio.cues.map((c) => c.text)).toEqual([
			'Lie on your back slowly.',
			'Slide your heel up.'
		]);
		expect(screen.studio.note).toBe('Showing the saved version; Undo brings your changes back.');
		expect(screen.autosave.words).toBe('Saved as version 5');
		screen.studio.undo();
		expect(screen.studio.cues[1].text).toBe('Slide your heel up, slowly.');
		screen.autosave.stop();
	});

	it('saves mine on top of theirs when asked', async () => {
		const { screen, fetch } = await conflicted();
		fetch.mockImplementation(async () => answer(201, { version: 6 }));
		screen.studio.note = 'Something said before.';
		screen.keepMine();
		expect(screen.studio.note).toBe('');
		await settle();
		expect(screen.autosave.words).toBe('Saved as version 6');
		const body = JSON.parse(String(fetch.mock.calls[1][1]?.body));
		expect(body.baseVersion).toBe(5);
		expect(body.cues[1].text).toBe('Slide your heel up, slowly.');
	});
});
