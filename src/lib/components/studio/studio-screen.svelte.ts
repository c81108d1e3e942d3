/**
 * The caption studio's screen: the cue editor (`Studio`: the cues, undo, the selection and the
 * checks) with its autosave, the changes kept on this device and offered back, the player the
 * cues are timed against, and the keys. Studio.svelte and its section components read and change
 * it; what they draw is theirs, what happens is here.
 */
import { untrack } from 'svelte';
import type { Cue, TrackKind } from '$lib/captions/types';
import {
	commandFor,
	focusKind,
	type Command,
	type Focus,
	type KeyLike
} from '$lib/captions/editor/keys';
import { plural } from '$lib/captions/editor/format';
import { Autosave } from './autosave.svelte';
import type { Draft } from './drafts';
import { Studio, type ProfileId } from './studio.svelte';
import type { SpriteLayout } from '$lib/media/sprite';

/** The loudness of the recording's sound, `peaksPerSecond` values a second, for the timeline. */
export interface Peaks {
	peaksPerSecond: number;
	peaks: number[];
}

export interface StudioRecording {
	id: string;
	durationSeconds: number;
	frameRate: number | null;
	sprite: SpriteLayout | null;
	hasWaveform: boolean;
	posterCount: number;
	width?: number | null;
	height?: number | null;
}

export interface StudioTrack {
	id: string;
	label: string;
	language: string;
	kind: TrackKind;
	version: number;
	cues: Cue[];
}

/** What the screen shows, from the page's data (read again whenever it changes). */
export interface StudioSource {
	recording: StudioRecording;
	track: StudioTrack;
	/** The clinic's own choice of guidelines. */
	clinicProfile: ProfileId;
}

/** The player as the screen drives it: the page's video element, or a stand-in in tests. */
export interface Player {
	currentTime: number;
	readonly paused: boolean;
	readonly seeking: boolean;
	play(): Promise<void>;
	pause(): void;
}

/** What commands ask of the sections that hold the focus, the zoom and the list of keys. */
export interface StudioView {
	focusText(key: string): void;
	/** With `reveal`, the page scrolls to the row too (asked from elsewhere on it). */
	focusRow(key: string, reveal?: boolean): void;
	zoomIn(): void;
	zoomOut(): void;
	/** Brings the list of keys into sight. */
	revealHelp(): void;
}

/** A key press as the screen reads it (a KeyboardEvent, or a stand-in in tests). */
export type KeyPress = KeyLike &
	Pick<KeyboardEvent, 'repeat' | 'isComposing' | 'defaultPrevented' | 'target' | 'preventDefault'>;

/** Held keys repeat for moving things bit by bit; nothing else should run twice by accident. */
const REPEATS = new Set<Command>([
	'nudge-back',
	'nudge-forward',
	'frame-back',
	'frame-forward',
	'seek-back',
	'seek-forward',
	'step-back',
	'step-forward',
	'undo',
	'redo'
]);

const NO_VIEW: StudioView = {
	focusText: () => {},
	focusRow: () => {},
	zoomIn: () => {},
	zoomOut: () => {},
	revealHelp: () => {}
};

/** Toolbar buttons act without taking the focus from the words being typed (their pointerdown). */
export function keepFocus(event: Pick<PointerEvent, 'preventDefault'>) {
	event.preventDefault();
}

export class StudioScreen {
	readonly studio: Studio;
	readonly autosave: Autosave;

	/** The player, once it is on the page. */
	player = $state<Player | undefined>();
	playing = $state(false);
	showHelp = $state(true);
	/** Changes this device kept that never reached Kinelume; editing waits until they are answered. */
	offer = $state.raw<Draft | null>(null);
	/** True once the kept changes have been looked for (the page is ready to edit). */
	ready = $state(false);
	waveform = $state.raw<Peaks | null>(null);
	/** Set by Studio.svelte: how commands reach its sections. */
	view: StudioView = NO_VIEW;

	readonly #source: () => StudioSource;

	constructor(source: () => StudioSource) {
		this.#source = source;
		// The page mounts a new studio for each track, so the first values are the ones to edit.
		const { recording, track, clinicProfile } = untrack(source);
		this.studio = new Studio({
			cues: track.cues,
			duration: recording.durationSeconds,
			frameRate: recording.frameRate,
			profileId: clinicProfile
		});
		this.autosave = new Autosave({ trackId: track.id, version: track.version, cues: track.cues });
		this.studio.onEdit = (cues) => this.autosave.changed(cues);
	}

	get recording(): StudioRecording {
		return this.#source().recording;
	}
	get track(): StudioTrack {
		return this.#source().track;
	}
	/** Where the recording's files are served. */
	get media(): string {
		return `/api/recordings/${this.recording.id}/media`;
	}

	/**
	 * Starts the screen: editing waits while a draft kept on this device is looked for (and, if
	 * one is found, until the clinician chooses); the waveform loads; a failed save goes again
	 * when the device is back online. Returns what ends it, for leaving the page or the track.
	 */
	open(): () => void {
		this.studio.locked = true;
		void this.autosave.findUnsaved().then((draft) => {
			this.offer = draft;
			this.studio.locked = draft !== null;
			this.ready = true;
		});
		if (this.recording.hasWaveform) {
			void fetch(`${this.media}/waveform.json`)
				.then((r) => (r.ok ? (r.json() as Promise<Peaks>) : null))
				.then((peaks) => (this.waveform = peaks))
				.catch(() => (this.waveform = null));
		}
		const online = () => {
			if (this.autosave.state === 'failed') this.autosave.saveNow();
		};
		globalThis.addEventListener?.('online', online);
		return () => {
			// Leaving for another track or page: changes waiting for their pause go now (the
			// draft stays on this device whatever happens to the request).
			if (this.autosave.state === 'waiting') this.autosave.saveNow();
			else this.autosave.stop();
			globalThis.removeEventListener?.('online', online);
		};
	}

	restoreDraft() {
		if (!this.offer) return;
		const draft = this.offer;
		this.offer = null;
		this.studio.locked = false;
		this.autosave.restore(draft);
		this.studio.replaceAll(draft.cues);
		this.studio.note = `Restored the ${plural(draft.cues.length, 'cue')} kept on this device.`;
	}

	discardDraft() {
		this.offer = null;
		this.studio.locked = false;
		this.autosave.discardDrafts();
		this.studio.note = 'Discarded the changes kept on this device.';
	}

	/** Conflict: saves the cues on screen on top of the newer version. */
	keepMine() {
		this.autosave.keepMine();
		this.studio.note = '';
	}

	/** Conflict: shows the newer version instead (one undo step, so Undo brings mine back). */
	takeTheirs() {
		const cues = this.autosave.takeTheirs();
		if (cues) {
			this.studio.replaceAll(cues);
			this.studio.note = 'Showing the saved version; Undo brings your changes back.';
		}
	}

	/** Moves the playhead (and the video) to `seconds`, kept within the recording. */
	seek(seconds: number) {
		const t = Math.min(Math.max(seconds, 0), this.recording.durationSeconds);
		this.studio.time = t;
		if (this.player) this.player.currentTime = t;
	}

	togglePlay() {
		const player = this.player;
		if (!player) return;
		if (player.paused)
			void player.play().catch(() => (this.studio.note = 'The video could not play.'));
		else player.pause();
	}

	/** The playhead takes the video's time (not while the video is still seeking). */
	syncTime() {
		if (this.player && !this.player.seeking) this.studio.time = this.player.currentTime;
	}

	// The video's own events, from its controls as well as from here.
	played() {
		this.playing = true;
	}
	paused() {
		this.playing = false;
		this.syncTime();
	}
	timeUpdated() {
		// While it plays, the playhead follows every frame instead (see StudioPlayer).
		if (!this.playing) this.syncTime();
	}

	toggleHelp() {
		this.showHelp = !this.showHelp;
	}

	/** A finding chosen in the checks panel: its cue selected, the playhead at its start, in sight. */
	goToFinding(index: number) {
		const cue = this.studio.cues[index];
		if (!cue) return;
		this.studio.select(cue.key);
		this.seek(cue.start);
		this.view.focusRow(cue.key, true);
	}

	/** The window's keydown: runs the key's command, if it has one where the focus is. */
	onKey(event: KeyPress, focus: Focus = focusKind(event.target)) {
		if (event.defaultPrevented || event.isComposing) return;
		const command = commandFor(event, focus);
		if (!command) return;
		event.preventDefault();
		if (event.repeat && !REPEATS.has(command)) return;
		this.run(command, focus);
	}

	/** Runs a command, from its key or its button; `focus` is where the focus was when asked. */
	run(command: Command, focus: Focus = activeFocus()) {
		const studio = this.studio;
		this.syncTime();
		switch (command) {
			case 'play-pause':
				return this.togglePlay();
			case 'mark-start':
				return studio.markStart();
			case 'mark-end':
				return studio.markEnd();
			case 'new-cue': {
				const key = studio.newCue();
				if (key) this.view.focusText(key);
				return;
			}
			case 'split':
				return studio.split();
			case 'merge':
				return studio.merge();
			case 'nudge-back':
				return studio.nudge(-0.1);
			case 'nudge-forward':
				return studio.nudge(0.1);
			case 'frame-back':
				return studio.nudge(-studio.frame);
			case 'frame-forward':
				return studio.nudge(studio.frame);
			case 'switch-edge':
				studio.switchEdge();
				studio.note = `Nudges now move the ${studio.edge}.`;
				return;
			case 'previous-cue':
			case 'next-cue': {
				const cue = studio.step(command === 'next-cue' ? 1 : -1);
				if (!cue) return;
				this.seek(cue.start);
				// Typing goes on in the next cue's words; otherwise the focus goes to its row.
				if (focus === 'text') this.view.focusText(cue.key);
				else this.view.focusRow(cue.key);
				return;
			}
			case 'seek-back':
				return this.seek(studio.time - 1);
			case 'seek-forward':
				return this.seek(studio.time + 1);
			case 'step-back':
				return this.seek(studio.time - studio.frame);
			case 'step-forward':
				return this.seek(studio.time + studio.frame);
			case 'edit-text': {
				const key = studio.selectedKey ?? studio.cues[studio.activeIndex]?.key;
				if (key) this.view.focusText(key);
				else studio.note = 'Select a cue first, or press N for a new one.';
				return;
			}
			case 'delete-cue':
				return studio.remove();
			case 'undo':
				return studio.undo();
			case 'redo':
				return studio.redo();
			case 'save':
				return this.autosave.saveNow();
			case 'zoom-in':
				return this.view.zoomIn();
			case 'zoom-out':
				return this.view.zoomOut();
			case 'help':
				this.toggleHelp();
				if (this.showHelp) queueMicrotask(() => this.view.revealHelp());
				return;
		}
	}
}

/** Where the page's focus is now (a button's command is asked with the focus where it was). */
function activeFocus(): Focus {
	return typeof document === 'undefined' ? 'other' : focusKind(document.activeElement);
}
