/** Words for a patient's record, shared by the invitation form and the details page. */
// Relative imports: drizzle-kit loads this through the schema, without SvelteKit's aliases.
import { PROTOCOL_IDS, PROTOCOLS } from '../clinical/phases';

import type { PrecautionId } from '../clinical/precautions';
export { PRECAUTIONS, type PrecautionId } from '../clinical/precautions';

/** The side a patient's condition affects, as stored on their record. */
export const PATIENT_SIDES = ['left', 'right', 'both', 'not applicable'] as const;

/** Precautions that limit a range and take the clinician's degrees. */
export const PRECAUTIONS_WITH_DEGREES: readonly PrecautionId[] = [
	'shoulder-external-rotation-limit'
];

/** Sex as the normal-value tables report it; optional on a patient's record. */
export { SEXES } from '../clinical/rom';
export const SEX_CHOICES: { value: string; label: string }[] = [
	{ value: '', label: 'Not recorded' },
	{ value: 'female', label: 'Female' },
	{ value: 'male', label: 'Male' }
];

export const PROTOCOL_IDS_LIST = PROTOCOL_IDS;

/** Protocol choices for a select: none, then the phase tables we ship. */
export const PROTOCOL_CHOICES: { value: string; label: string }[] = [
	{ value: '', label: 'None (follow the surgeon’s protocol)' },
	...PROTOCOL_IDS.map((id) => ({
		value: id,
		label: `${PROTOCOLS[id].name} (${PROTOCOLS[id].confidence === 'published' ? 'published weeks' : 'common practice'})`
	}))
];

export const SIDE_LABELS: Record<string, string> = {
	left: 'Left',
	right: 'Right',
	both: 'Both',
	'not applicable': 'Not applicable'
};

/** A short list first; the field accepts any IANA zone name. */
export const COMMON_TIME_ZONES = [
	'Europe/London',
	'Europe/Dublin',
	'Europe/Lisbon',
	'Europe/Paris',
	'Europe/Berlin',
	'America/New_York',
	'America/Chicago',
	'America/Denver',
	'America/Los_Angeles',
	'Australia/Sydney',
	'Pacific/Auckland'
] as const;
