/**
 * Small helpers the public library pages share: caching for the signed-out, absolute addresses
 * for shared links and Open Graph tags, and the card shape the pages send to the browser.
 */
import { config } from '../config';
import type { ExerciseCard } from './public';

/**
 * Lets shared caches keep a public page for a minute — only for the signed-out, whose page
 * carries nothing personal; a signed-in person's page names them, and the hook keeps it private.
 */
export function cachePublicPage(
	signedIn: boolean,
	setHeaders: (headers: Record<string, string>) => void
): void {
	if (!signedIn) setHeaders({ 'Cache-Control': 'public, max-age=60', Vary: 'Cookie' });
}

/** An absolute address on this site, for sitemap.xml, canonical links and Open Graph tags. */
export function absolute(path: string): string {
	return new URL(path, config().ORIGIN).href;
}

/** A card without the ids the page does not need. */
export function cardData(card: ExerciseCard) {
	return {
		slug: card.slug,
		versionId: card.versionId,
		title: card.title,
		bodyRegion: card.bodyRegion,
		position: card.position,
		movementType: card.movementType,
		phase: card.phase,
		posterCount: card.posterCount,
		durationSeconds: card.durationSeconds,
		excerpt: card.excerpt
	};
}
