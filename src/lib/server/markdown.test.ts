import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { renderSafetyNotes } from './markdown';

describe('renderSafetyNotes', () => {
	it('renders the allowed Markdown', () => {
		const html = renderSafetyNotes(
			[
				'## Stop if',
				'',
				'- pain is **sharp**',
				'- you feel *new* numbness',
				'',
				'1. first',
				'2. second',
				'',
				'> Ask your clinician.',
				'',
				'Keep the `stick` level.',
				'#### Small heading'
			].join('\n')
		);
		expect(html).toContain('<h3>Stop if</h3>');
		expect(html).toContain('<li>pain is <strong>sharp</strong></li>');
		expect(html).toContain('<em>new</em>');
		expect(html).toContain('<ol>');
		expect(html).toContain('<blockquote>');
		expect(html).toContain('<code>stick</code>');
		expect(html).toContain('<h4>Small heading</h4>');
	});

	it('answers an empty string for empty notes', () => {
		expect(renderSafetyNotes('')).toBe('');
		expect(renderSafetyNotes('  \n ')).toBe('');
	});

	it('keeps line breaks inside a paragraph', () => {
		expect(renderSafetyNotes('one\ntwo')).toBe('<p>one<br />two</p>');
	});

	it('keeps http, https and mailto links, with rel noopener', () => {
		const html = renderSafetyNotes(
			'[leaflet](https://clinic.example/leaflet) [old](http://clinic.example) [write](mailto:desk@clinic.example)'
		);
		expect(html).toContain('<a href="https://clinic.example/leaflet" rel="noopener noreferrer">');
		expect(html).toContain('<a href="http://clinic.example" rel="noopener noreferrer">');
		expect(html).toContain('<a href="mailto:desk@clinic.example" rel="noopener noreferrer">');
	});

	// The payloads below are the usual cross-site scripting shapes (common practice).
	it('removes script elements and their content', () => {
		const html = renderSafetyNotes(
			'Hello <script>alert(1)</script> there\n\n<script>alert(2)</script>'
		);
		expect(html).not.toMatch(/script/i);
		expect(html).not.toContain('alert');
		expect(html).toBe('<p>Hello  there</p>');
	});

	it('removes event handler attributes', () => {
		for (const md of [
			'<img src=x onerror=alert(1)>',
			'<p onclick="alert(1)">tap</p>',
			'<a href="https://ok.example" onmouseover="alert(1)">x</a>'
		]) {
			const html = renderSafetyNotes(md);
			expect(html).not.toMatch(/<img/i);
			expect(html).not.toMatch(/on\w+=|alert/i);
		}
	});

	it('drops javascript:, data: and protocol-relative links but keeps their words', () => {
		for (const href of [
			'javascript:alert(1)',
			'JaVaScRiPt:alert(1)',
			' javascript:alert(1)',
			'data:text/html;base64,PHNjcmlwdD5hbGVydCgxKTwvc2NyaXB0Pg==',
			'vbscript:msgbox(1)',
			'//evil.example/x'
		]) {
			const html = renderSafetyNotes(`[press here](${href})`);
			expect(html, href).not.toMatch(/href/i);
			expect(html, href).toContain('press here');
		}
	});

	it('never lets an encoded javascript: link through', () => {
		const html = renderSafetyNotes('[x](&#106;avascript:alert(1)) [y](java&#x09;script:alert(1))');
		expect(html).not.toMatch(/href/i);
	});

	it('removes iframes, objects, embeds and forms', () => {
		const html = renderSafetyNotes(
			'<iframe src="https://evil.example"></iframe><object data="x"></object><embed src="x"><form action="x"><input></form>'
		);
		expect(html).not.toMatch(/<(iframe|object|embed|form|input)/i);
		expect(html).not.toContain('evil');
	});

	it('removes style elements and style attributes', () => {
		const html = renderSafetyNotes(
			'<style>body{display:none}</style>\n\n<p style="position:fixed">x</p>\n\n**bold**'
		);
		expect(html).not.toMatch(/<style/i);
		expect(html).not.toMatch(/style=|display:none/i);
		expect(html).toContain('<strong>bold</strong>');
	});

	it('does not pass raw HTML through, even allowed tags', () => {
		const html = renderSafetyNotes('<strong>typed</strong> and <em>more</em>');
		expect(html).toBe('<p>typed and more</p>');
	});

	it('drops Markdown images, keeping their alt words', () => {
		const html = renderSafetyNotes('![a knee](https://img.example/x.png)');
		expect(html).not.toMatch(/<img/i);
		expect(html).toContain('a knee');
	});

	it('drops images whose alt text tries to break out', () => {
		const html = renderSafetyNotes('![x" onerror="alert(1)](x)');
		expect(html).not.toMatch(/<img/i);
		expect(html).not.toMatch(/<[a-z][^>]*\son\w+=/i);
	});

	it('keeps no attribute but href and rel', () => {
		const html = renderSafetyNotes('[a](https://ok.example "title here")');
		expect(html).toBe('<p><a href="https://ok.example" rel="noopener noreferrer">a</a></p>');
	});

	it('never emits a tag or attribute outside the allow-list, whatever the input', () => {
		const pieces = fc.constantFrom(
			'<script>',
			'</script>',
			'<img src=x onerror=alert(1)>',
			'<iframe>',
			'<a href="javascript:x">',
			'</a>',
			'[l](javascript:x)',
			'[l](https://ok.example)',
			'<style>',
			'**',
			'*',
			'\n',
			'\n\n',
			'- ',
			'> ',
			'`',
			'"',
			"'",
			'<',
			'>',
			'&',
			'text'
		);
		fc.assert(
			fc.property(fc.array(pieces, { maxLength: 30 }), (parts) => {
				const html = renderSafetyNotes(parts.join(''));
				for (const tag of html.matchAll(/<\/?([a-z0-9]+)([^>]*)>/gi)) {
					expect([
						'p',
						'ul',
						'ol',
						'li',
						'strong',
						'em',
						'a',
						'h3',
						'h4',
						'blockquote',
						'code',
						'br'
					]).toContain(tag[1].toLowerCase());
					const attributes = [...tag[2].matchAll(/([a-z-]+)=/gi)].map((m) => m[1]);
					for (const name of attributes) expect(['href', 'rel']).toContain(name);
					expect(tag[2]).not.toMatch(/href="(?!https?:|mailto:)/i);
				}
			})
		);
	});
});
