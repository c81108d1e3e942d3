/**
 * Small helpers the public library pages share: caching for the signed-out, absolute addresses
 * for shared links and Open Graph tags, and the card shape the pages send to the browser.
 */
import { LRUCache } from 'lru-cache';
import { config } from '../config';
import { renderSafetyNotes } from '../markdown';
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

// A published version never changes, so its safety notes are rendered once, not per visit.
const safetyHtml = new LRUCache<string, string>({ max: 1000 });

/** A published version's safety notes as sanitised HTML (renderSafetyNotes), kept by version id. */
export function versionSafetyHtml(version: {
	id: string;
	snapshot: { safetyNotes: string };
}): string {
	let html = safetyHtml.get(version.id);
	if (html === undefined) {
		html = renderSafetyNotes(version.snapshot.safetyNotes);
		safetyHtml.set(version.id, html);
	}
	return html;
}
