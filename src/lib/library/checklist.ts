/**
 * The review checklist the system computes for a submission, shown beside the educator's own
 * judgement. Publishing needs every item to pass (DESIGN.md §3: captions that pass the checks,
 * safety notes, dosage, a recorded consent and licence) and, on top, no patient data in any
 * text the public would read.
 */
import { checkCues, profiles, type GuidelineProfile } from '../captions/checks';
import { plainText } from '../captions/text';
import { formatTimestamp } from '../captions/timestamp';
import type { Cue } from '../captions/types';
import { CaptionWriteError, cuesAsServed } from '../captions/vtt';
import { DOSAGE_FIELD_LABELS, DOSAGE_FIELDS, DOSAGE_LIMITS } from '../dosage/types';
import { excerptAround, findPatientData, PATIENT_DATA_LABELS } from './privacy';
import { isLicence, type ExerciseSnapshot, type SubmissionKind } from './types';

/**
 * The library checks every submission against one captioning profile, whatever the submitting
 * clinic chose for itself, so that every public exercise meets the same bar.
 */
export const LIBRARY_CAPTION_PROFILE: GuidelineProfile = profiles.bbc;

/** Safety notes shorter than this (in letters, after Markdown is read as text) say too little. */
export const MIN_SAFETY_NOTE_CHARS = 20;

export type ChecklistItemId = 'captions' | 'safety-notes' | 'dosage' | 'consent' | 'patient-data';

export interface ChecklistItem {
	id: ChecklistItemId;
	label: string;
	passed: boolean;
	/** One sentence: what was found. */
	summary: string;
	/** Each problem, in words the clinician can act on. */
	problems: string[];
}

export interface Checklist {
	profile: GuidelineProfile['id'];
	passed: boolean;
	items: ChecklistItem[];
}

export interface ChecklistInput {
	snapshot: ExerciseSnapshot;
	consentConfirmed: boolean;
	licence: string;
	attribution: string;
}

/** The educator's own judgement, ticked on the review screen; approval needs every one. */
export const JUDGEMENT_ITEMS = [
	{
		id: 'safe-demonstration',
		label: 'The demonstration is safe to copy at home and matches its words'
	},
	{
		id: 'plain-words',
		label: 'The words suit the public: nothing only one clinic or one patient would follow'
	},
	{
		id: 'no-identifying-detail',
		label: 'Nothing on screen or in the sound identifies a patient'
	}
] as const;

/**
 * A caption revision changes only the captions: the educator judges those, since the clip and
 * the other words were judged when the version was approved.
 */
export const CAPTION_JUDGEMENT_ITEMS = [
	{
		id: 'captions-match',
		label: 'The captions say what is said in the clip, at the time it is said'
	},
	{
		id: 'plain-words',
		label: 'The words suit the public: nothing only one clinic or one patient would follow'
	}
] as const;

export type JudgementId =
	| (typeof JUDGEMENT_ITEMS)[number]['id']
	| (typeof CAPTION_JUDGEMENT_ITEMS)[number]['id'];

/** The judgement items the educator ticks to approve a submission of this kind. */
export function judgementItemsFor(
	kind: SubmissionKind
): readonly { id: JudgementId; label: string }[] {
	return kind === 'captions' ? CAPTION_JUDGEMENT_ITEMS : JUDGEMENT_ITEMS;
}

const MAX_LISTED = 8;

const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

function captionsItem(snapshot: ExerciseSnapshot, profile: GuidelineProfile): ChecklistItem {
	const label = `Captions pass the caption checks (${profile.label})`;
	const cues = snapshot.cues;
	if (cues.length === 0) {
		return {
			id: 'captions',
			label,
			passed: false,
			summary: 'The segment has no captions.',
			problems: ['Add captions to the recording; the segment follows its captions track.']
		};
	}
	const findings = checkCues(cues, profile);
	const errors = findings.filter((f) => f.severity === 'error');
	const warnings = findings.length - errors.length;
	const listed = errors.slice(0, MAX_LISTED).map((f) => {
		const cue = cues[f.index];
		return `Cue ${f.index + 1} at ${formatTimestamp(Math.max(0, cue.start), { hours: 'auto' })}: ${f.message}`;
	});
	if (errors.length > MAX_LISTED) listed.push(`…and ${errors.length - MAX_LISTED} more.`);
	if (errors.length > 0) {
		listed.push(
			'To fix: correct the recording’s captions; the segment follows them, so nothing is cut again.'
		);
	}
	return {
		id: 'captions',
		label,
		passed: errors.length === 0,
		summary:
			errors.length === 0
				? `${plural(cues.length, 'cue')}, no errors${warnings ? ` (${plural(warnings, 'warning')} to consider)` : ''}.`
				: `${plural(errors.length, 'error')} in ${plural(cues.length, 'cue')}${warnings ? `, and ${plural(warnings, 'warning')}` : ''}.`,
		problems: listed
	};
}

function safetyNotesItem(snapshot: ExerciseSnapshot): ChecklistItem {
	const letters = snapshot.safetyNotes.replace(/[#*_>`[\]()-]/g, '').trim().length;
	const passed = letters >= MIN_SAFETY_NOTE_CHARS;
	return {
		id: 'safety-notes',
		label: 'Safety notes are present',
		passed,
		summary: passed
			? 'The exercise has safety notes.'
			: letters === 0
				? 'The exercise has no safety notes.'
				: 'The safety notes are too short to say what to mind.',
		problems: passed
			? []
			: [
					`Write at least ${MIN_SAFETY_NOTE_CHARS} characters of safety notes: what is normal to feel and what means stop.`
				]
	};
}

function dosageItem(snapshot: ExerciseSnapshot): ChecklistItem {
	const problems: string[] = [];
	for (const field of DOSAGE_FIELDS) {
		const value = snapshot.dosage?.[field];
		const { min, max } = DOSAGE_LIMITS[field];
		if (typeof value !== 'number' || !Number.isInteger(value) || value < min || value > max) {
			problems.push(`${DOSAGE_FIELD_LABELS[field]} must be a whole number from ${min} to ${max}.`);
		}
	}
	return {
		id: 'dosage',
		label: 'A typical starting dosage is present',
		passed: problems.length === 0,
		summary:
			problems.length === 0
				? 'Sets, reps, hold, rest, sessions a day and days a week are all set.'
				: 'The dosage is incomplete.',
		problems
	};
}

function consentItem(input: ChecklistInput): ChecklistItem {
	const problems: string[] = [];
	if (!input.consentConfirmed) {
		problems.push('Confirm that everyone filmed agreed to publication.');
	}
	if (!isLicence(input.licence)) problems.push('Choose a licence.');
	if (!input.attribution.trim()) problems.push('Give the credit line the public will see.');
	return {
		id: 'consent',
		label: 'Consent and licence are recorded',
		passed: problems.length === 0,
		summary:
			problems.length === 0
				? 'Consent to publication is confirmed, with a licence and a credit line.'
				: 'Consent or licence is missing.',
		problems
	};
}

const captionTexts = (cues: readonly Cue[]) =>
	cues.map((c, i) => ({ field: `Caption ${i + 1}`, text: plainText(c.text) }));

/** The texts the public would read, each with the name a reviewer knows it by. */
export function publicTexts(input: ChecklistInput): { field: string; text: string }[] {
	const s = input.snapshot;
	return [
		{ field: 'Title', text: s.title },
		{ field: 'Description', text: s.description },
		...s.coachingCues.map((c, i) => ({ field: `Key point ${i + 1}`, text: c.text })),
		{ field: 'Safety notes', text: s.safetyNotes },
		...captionTexts(s.cues),
		{ field: 'Credit line', text: input.attribution }
	];
}

function patientDataItem(
	texts: { field: string; text: string }[],
	label = 'No patient data in any text (e-mail addresses, phone numbers, dates of birth)'
): ChecklistItem {
	const problems: string[] = [];
	for (const { field, text } of texts) {
		for (const match of findPatientData(text)) {
			problems.push(
				`${field} has what looks like ${PATIENT_DATA_LABELS[match.kind]}: “${excerptAround(text, match)}”`
			);
		}
	}
	const count = problems.length;
	return {
		id: 'patient-data',
		label,
		passed: count === 0,
		summary:
			count === 0
				? 'Nothing that looks like a person’s details was found.'
				: `${plural(count, 'piece')} of text look like a person’s details.`,
		problems: problems
			.slice(0, MAX_LISTED)
			.concat(count > MAX_LISTED ? [`…and ${count - MAX_LISTED} more.`] : [])
	};
}

/**
 * The captions as a browser reads the served file, with their item. Every caption item judges
 * that file; captions that cannot be written as a file at all fail their item, and the rest is
 * judged as stored.
 */
function servedCaptions(
	snapshot: ExerciseSnapshot,
	profile: GuidelineProfile
): { served: ExerciseSnapshot; captions: ChecklistItem } {
	try {
		const served = { ...snapshot, cues: cuesAsServed(snapshot.cues) };
		return { served, captions: captionsItem(served, profile) };
	} catch (thrown) {
		if (!(thrown instanceof CaptionWriteError)) throw thrown;
		return {
			served: snapshot,
			captions: {
				id: 'captions',
				label: `Captions pass the caption checks (${profile.label})`,
				passed: false,
				summary: 'The captions cannot be written as a caption file.',
				problems: [thrown.message]
			}
		};
	}
}

/** Every item, in the order the review screen shows them. */
export function computeChecklist(
	input: ChecklistInput,
	profile: GuidelineProfile = LIBRARY_CAPTION_PROFILE
): Checklist {
	const { served, captions } = servedCaptions(input.snapshot, profile);
	const items = [
		captions,
		safetyNotesItem(served),
		dosageItem(served),
		consentItem(input),
		patientDataItem(publicTexts({ ...input, snapshot: served }))
	];
	return { profile: profile.id, passed: items.every((i) => i.passed), items };
}

/**
 * The caption items alone, for a caption revision (everything else is the published
 * version's, checked when it was approved): the caption checks under the profile, and no
 * patient data in the caption text.
 */
export function computeCaptionChecklist(
	snapshot: ExerciseSnapshot,
	profile: GuidelineProfile = LIBRARY_CAPTION_PROFILE
): Checklist {
	const { served, captions } = servedCaptions(snapshot, profile);
	const items = [
		captions,
		patientDataItem(
			captionTexts(served.cues),
			'No patient data in the captions (e-mail addresses, phone numbers, dates of birth)'
		)
	];
	return { profile: profile.id, passed: items.every((i) => i.passed), items };
}

/** The judgement ids in `ticked` that are real for this kind, in the checklist's order. */
export function judgementTicked(
	ticked: readonly string[],
	kind: SubmissionKind = 'exercise'
): JudgementId[] {
	return judgementItemsFor(kind)
		.map((j) => j.id)
		.filter((id) => ticked.includes(id));
}
