/**
 * What a field's `aria-describedby` names: its hint (`<id>-hint`) and its problems
 * (`<id>-problems`), those it has; undefined when it has neither.
 */
export function describedBy(
	id: string,
	hasHint: boolean,
	hasProblems: boolean
): string | undefined {
	const ids = [hasHint ? `${id}-hint` : '', hasProblems ? `${id}-problems` : ''].filter(Boolean);
	return ids.length ? ids.join(' ') : undefined;
}
