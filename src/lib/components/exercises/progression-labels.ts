import type { ProgressionDraft } from '$lib/exercises/form-text';

export type ProgressionField = keyof ProgressionDraft;

/** The progression inputs' labels, which name the kind's numbers (the form's and the builder's). */
export function progressionLabel(field: ProgressionField, kind: string): string {
	switch (field) {
		case 'kind':
			return 'Progression';
		case 'addPerWeek':
			return kind === 'reps' ? 'Reps added each week' : 'Seconds added each week';
		case 'add':
			return 'Sets added each time';
		case 'addAfterWeeks':
			return 'Every how many weeks';
		case 'ceiling':
			return kind === 'hold' ? 'Longest hold (seconds)' : `Most ${kind}`;
	}
}

/** The progression inputs a kind shows, in order. */
export function progressionFieldsOf(kind: string): ProgressionField[] {
	if (kind === 'reps' || kind === 'hold') return ['kind', 'addPerWeek', 'ceiling'];
	if (kind === 'sets') return ['kind', 'add', 'addAfterWeeks', 'ceiling'];
	return ['kind'];
}
