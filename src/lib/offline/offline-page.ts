/**
 * The small page the service worker answers with when a patient page is opened without a
 * connection and no copy of it is saved on the phone. Self-contained (no scripts, styles inline),
 * so it needs nothing else from the cache.
 */

const STYLE = [
	'body{margin:0;background:#faf8f4;color:#1c2230;font:18px/1.5 system-ui,sans-serif}',
	'main{max-width:36rem;margin:0 auto;padding:2rem 1rem}',
	'h1{font-size:2rem;margin:0 0 1rem}',
	'a{display:inline-flex;align-items:center;min-height:44px;padding:0 1rem;margin:0.5rem 0;',
	'border:2px solid #1f4d3e;border-radius:0.5rem;color:#1f4d3e;font-weight:700;text-decoration:none}'
].join('');

/** The page's HTML; `todaySaved` offers today's programme when a copy of it is on the phone. */
export function offlinePageHtml({ todaySaved }: { todaySaved: boolean }): string {
	const today = todaySaved
		? '<p>Your programme for today is saved on this phone, with the exercises you have opened before.</p>' +
			'<p><a href="/today">Open today’s programme</a></p>'
		: '';
	return [
		'<!doctype html>',
		'<html lang="en"><head><meta charset="utf-8">',
		'<meta name="viewport" content="width=device-width, initial-scale=1">',
		'<title>You are offline · Kinelume</title>',
		`<style>${STYLE}</style></head><body><main>`,
		'<h1>You are offline</h1>',
		'<p>This page is not saved on this phone, so it cannot open without a connection.</p>',
		today,
		'<p>Sessions you log are kept on this phone and sent when you are back online.</p>',
		'<p><a href="">Try again</a></p>',
		'</main></body></html>'
	].join('');
}

/** The answer itself: 503 (nothing from the server), never stored, its own strict policy. */
export function offlinePageResponse(options: { todaySaved: boolean }): Response {
	return new Response(offlinePageHtml(options), {
		status: 503,
		headers: {
			'Content-Type': 'text/html; charset=utf-8',
			'Cache-Control': 'no-store',
			'Content-Security-Policy':
				"default-src 'none'; style-src 'unsafe-inline'; base-uri 'none'; form-action 'none'; frame-ancestors 'none'"
		}
	});
}
