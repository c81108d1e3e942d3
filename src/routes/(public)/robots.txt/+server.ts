import { absolute } from '$lib/server/library/pages';
import type { RequestHandler } from './$types';

/**
 * Crawlers may read the public library and the start page; everything else is for signed-in
 * people (and refuses the signed-out anyway), and the API is not for indexing.
 */
export const GET: RequestHandler = () => {
	const body = [
		'User-agent: *',
		'Allow: /$',
		'Allow: /library',
		'Allow: /api/library/versions/',
		'Disallow: /',
		'',
		`Sitemap: ${absolute('/sitemap.xml')}`,
		''
	].join('\n');
	return new Response(body, {
		headers: {
			'Content-Type': 'text/plain; charset=utf-8',
			'Cache-Control': 'public, max-age=3600'
		}
	});
};
