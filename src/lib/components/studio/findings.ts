/** How the studio words findings and fixes. */
import type { FixKind, GuidelineProfile, Limit } from '$lib/captions/checks';

export const FIX_LABEL: Record<FixKind, string> = {
	'reflow-lines': 'Re-flow the lines',
	'extend-into-gap': 'Lengthen into the gap',
	'split-cue': 'Split in two',
	'close-gap': 'Close the gap'
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
