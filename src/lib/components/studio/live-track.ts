/**
 * Shows the cues being edited on the video: a text track added to the element, whose cues are
 * brought in line with the editor's after every change. The editor's cue objects never change
 * (an edit makes new ones), so a cue already on the track is kept as long as its object is.
 */
import type { Cue, CueSettings } from '$lib/captions/types';

export class LiveTrack {
	readonly track: TextTrack;
	#shown = new Map<Cue, VTTCue>();

	constructor(
		video: HTMLVideoElement,
		kind: 'captions' | 'subtitles',
		label: string,
		language: string
	) {
		this.track = video.addTextTrack(kind, label, language);
		this.track.mode = 'showing';
	}

	update(cues: readonly Cue[]) {
		const wanted = new Set(cues);
		for (const [cue, vtt] of this.#shown) {
			if (!wanted.has(cue)) {
				this.track.removeCue(vtt);
				this.#shown.delete(cue);
			}
		}
		for (const cue of cues) {
			if (this.#shown.has(cue) || !(cue.end > cue.start)) continue;
			const vtt = new VTTCue(cue.start, cue.end, cue.text);
			vtt.id = cue.id;
			if (cue.settings) applySettings(vtt, cue.settings);
			this.track.addCue(vtt);
			this.#shown.set(cue, vtt);
		}
	}
}

function applySettings(vtt: VTTCue, s: CueSettings) {
	// A value the browser refuses leaves that setting at its default, as a WebVTT parser would.
	const set = (apply: () => void) => {
		try {
			apply();
		} catch {
			// Ignored on purpose.
		}
	};
	if (s.vertical) set(() => (vtt.vertical = s.vertical!));
	if (s.snapToLines !== undefined) set(() => (vtt.snapToLines = s.snapToLines!));
	if (s.line !== undefined) set(() => (vtt.line = s.line!));
	if (s.lineAlign) set(() => (vtt.lineAlign = s.lineAlign!));
	if (s.position !== undefined) set(() => (vtt.position = s.position!));
	if (s.positionAlign) set(() => (vtt.positionAlign = s.positionAlign!));
	if (s.size !== undefined) set(() => (vtt.size = s.size!));
	if (s.align) set(() => (vtt.align = s.align!));
}
