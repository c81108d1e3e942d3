/** Which fields of a dosage fall outside the range an exercise allows. */
import { DOSAGE_FIELDS, DOSAGE_FIELD_LABELS } from './types';
import type { Dosage, DosageBounds, DosageField } from './types';

/** One field outside its range, with a sentence saying so. */
export interface BoundsIssue {
	field: DosageField;
	value: number;
	/** The end of the range it passed. */
	limit: number;
	side: 'below' | 'above';
	message: string;
}

/** Every field of `dosage` below its `min` or above its `max` in `bounds`, in form order. */
export function outOfBounds(dosage: Dosage, bounds: DosageBounds): BoundsIssue[] {
	const issues: BoundsIssue[] = [];
	for (const field of DOSAGE_FIELDS) {
		const range = bounds[field];
		if (!range) continue;
		const value = dosage[field];
		const label = DOSAGE_FIELD_LABELS[field];
		if (range.min !== undefined && value < range.min) {
			issues.push({
				field,
				value,
				limit: range.min,
				side: 'below',
				message: `${label} is ${value}, below this exercise's lowest of ${range.min}.`
			});
		} else if (range.max !== undefined && value > range.max) {
			issues.push({
				field,
				value,
				limit: range.max,
				side: 'above',
				message: `${label} is ${value}, above this exercise's highest of ${range.max}.`
			});
		}
	}
	return issues;
}
