/**
 * The exercise form's text helpers: cue times, comma lists and a progression as text. Pure and
 * light, for the browser (the exercise form, the programme builder) as much as the server; the
 * drafts themselves and their checking are in ./form, which the browser does not need.
 */
import type { Progression } from '$lib/dosage';

export interface CueDraft {
	text: string;
	/** "m:ss", "ss" or empty. */
	at: string;
}

export interface ProgressionDraft {
	kind: string;
	addPerWeek: string;
	ceiling: string;
	addAfterWeeks: string;
	add: string;
}

const str = (n: number | undefined | null) => (n === undefined || n === null ? '' : String(n));

/** Seconds as "m:ss" (with tenths when there are any), e.g. 72 → "1:12", 4.5 → "0:04.5". */
export function formatCueTime(seconds: number): string {
	const tenths = Math.round(seconds * 10);
	const minutes = Math.floor(tenths / 600);
	const rest = (tenths - minutes * 600) / 10;
	const whole = Math.floor(rest);
	const fraction = Math.round((rest - whole) * 10);
	return `${minutes}:${String(whole).padStart(2, '0')}${fraction ? `.${fraction}` : ''}`;
}

/** "1:12", "72", "0:04.5" → seconds; "" → undefined; anything else → NaN (refused with a message). */
export function parseCueTime(text: string): number | undefined {
	const t = text.trim();
	if (t === '') return undefined;
	const m = /^(?:(\d{1,3}):)?(\d{1,4}(?:\.\d+)?)$/.exec(t);
	if (!m) return Number.NaN;
	const minutes = m[1] === undefined ? 0 : Number(m[1]);
	const seconds = Number(m[2]);
	if (m[1] !== undefined && seconds >= 60) return Number.NaN;
	return minutes * 60 + seconds;
}

/** "Chair, towel,, step" → ["Chair", "towel", "step"], without repeats (ignoring case). */
export function splitList(text: string): string[] {
	const seen = new Set<string>();
	const out: string[] = [];
	for (const part of text.split(/[,\n]/)) {
		const item = part.trim().replace(/\s+/g, ' ');
		if (!item || seen.has(item.toLowerCase())) continue;
		seen.add(item.toLowerCase());
		out.push(item);
	}
	return out;
}

/** A progression as form text. */
export function progressionDraft(p: Progression): ProgressionDraft {
	return {
		kind: p.kind,
		addPerWeek: p.kind === 'reps' ? str(p.addPerWeek) : p.kind === 'hold' ? str(p.addPerWeek) : '',
		ceiling: p.kind === 'none' ? '' : str(p.ceiling),
		addAfterWeeks: p.kind === 'sets' ? str(p.addAfterWeeks) : '',
		add: p.kind === 'sets' ? str(p.add) : ''
	};
}

/** Form text of a progression as the shape progressionSchema checks (only the kind's own numbers). */
export function progressionFromDraft(p: ProgressionDraft): Record<string, string> {
	switch (p.kind) {
		case 'reps':
		case 'hold':
			return { kind: p.kind, addPerWeek: p.addPerWeek, ceiling: p.ceiling };
		case 'sets':
			return { kind: p.kind, addAfterWeeks: p.addAfterWeeks, add: p.add, ceiling: p.ceiling };
		default:
			return { kind: p.kind };
	}
}
