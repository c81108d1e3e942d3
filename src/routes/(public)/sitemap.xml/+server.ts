import { absolute } from '$lib/server/library/pages';
import { sitemapEntries } from '$lib/server/library/public';
import type { RequestHandler } from './$types';

const escapeXml = (value: string) =>
	value.replace(
		/[<>&'"]/g,
		(c) => `&${{ '<': 'lt', '>': 'gt', '&': 'amp', "'": 'apos', '"': 'quot' }[c]};`
	);

/**
 * The public pages for search engines (sitemaps.org protocol 0.9): the start page, the
 * library and every published exercise and collection — nothing under review or withdrawn.
 */
export const GET: RequestHandler = () => {
	const urls = [
		{ path: '/', updatedAt: null },
		{ path: '/library', updatedAt: null },
		...sitemapEntries()
	];
	const body = [
		'<?xml version="1.0" encoding="UTF-8"?>',
		'<urlset xmlns="http://www.sitemaps.org/schemas/sitemap/0.9">',
		...urls.map(
			(u) =>
				`<url><loc>${escapeXml(absolute(u.path))}</loc>${u.updatedAt ? `<lastmod>${u.updatedAt.toISOString()}</lastmod>` : ''}</url>`
		),
		'</urlset>',
		''
	].join('\n');
	return new Response(body, {
		headers: {
			'Content-Type': 'application/xml; charset=utf-8',
			'Cache-Control': 'public, max-age=300'
		}
	});
};
