import { error } from '@sveltejs/kit';
import { plainText } from '$lib/captions/text';
import { describeDosage } from '$lib/dosage';
import { LICENCE_LABELS, LICENCE_LINKS } from '$lib/library/types';
import { versionUrls } from '$lib/server/library/media';
import { absolute, cachePublicPage, versionSafetyHtml } from '$lib/server/library/pages';
import { collectionsWith, findPublicExercise } from '$lib/server/library/public';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = ({ params, locals, setHeaders }) => {
	const found = findPublicExercise(params.slug);
	if (!found) error(404, 'Not found.');
	if (found.kind === 'retired') {
		error(410, 'This exercise was retired from the library and is no longer available.');
	}
	cachePublicPage(locals.user !== null, setHeaders);
	const { entry, version } = found.value;
	const s = version.snapshot;
	const urls = versionUrls(version);
	const path = `/library/exercises/${entry.slug}`;
	return {
		exercise: {
			slug: entry.slug,
			title: s.title,
			description: s.description,
			bodyRegion: s.bodyRegion,
			side: s.side,
			position: s.position,
			movementType: s.movementType,
			phase: s.phase,
			equipment: s.equipment,
			coachingCues: s.coachingCues,
			dosage: describeDosage(s.dosage),
			safetyHtml: versionSafetyHtml(version),
			licence: LICENCE_LABELS[version.licence],
			licenceUrl: LICENCE_LINKS[version.licence] ?? null,
			attribution: version.attribution,
			version: version.version,
			publishedAt: version.publishedAt.toISOString()
		},
		media: {
			clip: urls.clip,
			captions: urls.captions,
			poster: urls.posters[0] ?? null,
			language: s.segment.captionsLanguage,
			shape: { width: s.segment.width ?? null, height: s.segment.height ?? null }
		},
		lines: s.cues.map((c) => ({ start: c.start, end: c.end, text: plainText(c.text) })),
		collections: collectionsWith(entry.id),
		canonical: absolute(path),
		ogImage: urls.posters[0] ? absolute(urls.posters[0]) : null,
		ogVideo: absolute(urls.clip),
		summary: (s.description || `${s.title}: an exercise demonstration with captions.`).slice(0, 200)
	};
};
