import { page } from '$app/state';
import { DEFAULT_TIME_ZONE, formatInstant, type InstantStyle } from '$lib/format/instants';

/**
 * The signed-in person's time zone (their clinic's, or a patient's own) from the root layout's
 * data; the default for signed-out pages. Call it while a component renders.
 */
export function viewerTimeZone(): string {
	const viewer = page.data.viewer as { timeZone?: string } | null | undefined;
	return viewer?.timeZone ?? DEFAULT_TIME_ZONE;
}

/** `formatInstant` in the viewer's time zone. */
export function viewerInstant(value: Date | string | number, style?: InstantStyle): string {
	return formatInstant(value, viewerTimeZone(), style);
}
