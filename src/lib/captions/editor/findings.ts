/** How the studio words findings and fixes. */
import type { Finding, FindingKind, FixKind, GuidelineProfile, Limit } from '$lib/captions/checks';
import { canFixAll } from '$lib/captions/fixes';

export const FIX_LABEL: Record<FixKind, string> = {
	'reflow-lines': 'Re-flow the lines',
	'extend-into-gap': 'Lengthen into the gap',
	'split-cue': 'Split in two',
	'close-gap': 'Close the gap'
};

/** A plain name for each kind of finding, in the order the checks panel lists them. */
export const KIND_TITLE: Record<FindingKind, string> = {
	'end-before-start': 'Ends before it starts',
	'out-of-order': 'Out of order',
	overlap: 'Overlaps another cue',
	empty: 'No words',
	'unbalanced-tags': 'Tags that do not match',
	'reading-rate': 'Reading rate too high',
	'too-short': 'On screen too briefly',
	'too-long': 'On screen too long',
	'line-too-long': 'Lines too long',
	'too-many-lines': 'Too many lines',
	'gap-too-short': 'Gaps too short'
};

/** What "Fix all" does to each cue of a kind, for the button's description. */
export const FIX_ALL_WORDS: Partial<Record<FindingKind, string>> = {
	'reading-rate': 'Shows each cue long enough to read, in the free time after it.',
	'too-short': 'Shows each cue long enough to read, in the free time after it.',
	'too-long': 'Splits each cue at its sentences or phrases into parts short enough.',
	'line-too-long':
		'Re-flows the lines of each cue; a cue with too many words for its lines is split.',
	'too-many-lines':
		'Re-flows the lines of each cue; a cue with too many words for its lines is split.',
	'gap-too-short': 'Runs each cue on to the next one.'
};

/**
 * A finding's message without the guideline it quotes, and that guideline on its own, so a
 * narrow cue list can show the point and the checks panel the reason.
 */
export function splitSource(
	message: string,
	profile: GuidelineProfile
): { text: string; source: string | null } {
	const limits = Object.values(profile).filter(
		(value): value is Limit => typeof value === 'object' && value !== null && 'source' in value
	);
	for (const { source } of limits) {
		const quoted = ` (${source})`;
		const at = message.indexOf(quoted);
		if (at >= 0) {
			return { text: message.slice(0, at) + message.slice(at + quoted.length), source };
		}
	}
	return { text: message, source: null };
}

export interface FindingGroup {
	kind: FindingKind;
	title: string;
	/** Each guideline the group's findings quote, once. */
	sources: string[];
	/** The findings in cue order, each with its message less the guideline. */
	items: { finding: Finding; text: string }[];
	errors: number;
	/** Whether "Fix all" is offered: the fix is mechanical and more than one finding has one. */
	fixAll: boolean;
}

const ORDER = Object.keys(KIND_TITLE) as FindingKind[];

/** The findings by kind, each guideline named once per kind rather than on every finding. */
export function groupFindings(
	findings: readonly Finding[],
	profile: GuidelineProfile
): FindingGroup[] {
	const groups = new Map<FindingKind, FindingGroup>();
	for (const finding of findings) {
		let group = groups.get(finding.kind);
		if (!group) {
			group = {
				kind: finding.kind,
				title: KIND_TITLE[finding.kind],
				sources: [],
				items: [],
				errors: 0,
				fixAll: false
			};
			groups.set(finding.kind, group);
		}
		const { text, source } = splitSource(finding.message, profile);
		if (source && !group.sources.includes(source)) group.sources.push(source);
		group.items.push({ finding, text });
		if (finding.severity === 'error') group.errors++;
	}
	for (const group of groups.values()) {
		group.items.sort((a, b) => a.finding.index - b.finding.index);
		group.fixAll = canFixAll(group.kind) && group.items.filter((i) => i.finding.fix).length > 1;
	}
	return ORDER.flatMap((kind) => groups.get(kind) ?? []);
}
