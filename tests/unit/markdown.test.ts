import { describe, expect, test } from 'vitest';
import { parseDocument } from 'htmlparser2';
import {
	MAX_SCRIPT_CHARACTERS,
	SCRIPT_LINK_REL,
	renderScriptMarkdown
} from '../../src/lib/server/episodes/markdown.ts';
import { SCRIPT_TAGS } from '../helpers/script-tags';

// The hostile inputs are classic payloads from the OWASP XSS Filter Evasion
// Cheat Sheet (from memory). The output is checked by parsing it again with
// htmlparser2 (the general-purpose HTML parser sanitize-html itself is built
// on, installed with it), so the checks look at elements and attributes as a
// browser would build them, not at substrings.

type ParsedElement = { name: string; attribs: Record<string, string> };

function elementsOf(html: string): ParsedElement[] {
	const found: ParsedElement[] = [];
	const walk = (nodes: unknown[]): void => {
		for (const node of nodes as {
			type: string;
			name?: string;
			attribs?: Record<string, string>;
			children?: unknown[];
		}[]) {
			if (node.type === 'tag' || node.type === 'script' || node.type === 'style') {
				found.push({ name: node.name ?? '', attribs: node.attribs ?? {} });
			}
			if (node.children) walk(node.children);
		}
	};
	walk(parseDocument(html).children);
	return found;
}

/** The URL scheme a browser would see: WHATWG URL strips tab/newline anywhere and C0/space at the ends. */
function browserScheme(href: string): string | undefined {
	const cleaned = href.replace(/[\t\n\r]/g, '').replace(/^[\x00-\x20]+|[\x00-\x20]+$/g, '');
	return /^([a-z][a-z0-9+.-]*):/i.exec(cleaned)?.[1]?.toLowerCase();
}

function expectOnlySafeMarkup(html: string): void {
	for (const element of elementsOf(html)) {
		expect(SCRIPT_TAGS.has(element.name), `tag <${element.name}> in ${html}`).toBe(true);
		for (const [name, value] of Object.entries(element.attribs)) {
			expect(name.startsWith('on'), `event handler ${name} in ${html}`).toBe(false);
			expect(name, `style attribute in ${html}`).not.toBe('style');
			if (name === 'href') {
				expect(['http', 'https', 'mailto'], `href ${value}`).toContain(browserScheme(value));
			}
		}
	}
}

describe('renderScriptMarkdown: crew directions', () => {
	// Our own convention (see $lib/script/timing: [[…]] is not counted as spoken words).
	test('[[…]] becomes a marked span, its Markdown kept, and the words around it stay prose', () => {
		const html = renderScriptMarkdown('Hose off. [[B-roll: **hose** at droop]] Then the new one.');
		const spans = elementsOf(html).filter((element) => element.name === 'span');
		expect(spans).toHaveLength(1);
		expect(spans[0].attribs.class).toBe('direction');
		expect(html).toContain('<span class="direction">B-roll: <strong>hose</strong> at droop</span>');
		expect(html).toContain('Hose off.');
		expectOnlySafeMarkup(html);
	});

	test('a span class other than direction, or a direction carrying script, is cleaned', () => {
		expect(renderScriptMarkdown('<span class="evil" onclick="x()">hi</span>')).toBe(
			'<p><span>hi</span></p>\n'
		);
		const html = renderScriptMarkdown('[[<img src=x onerror=alert(1)> cue]]');
		expectOnlySafeMarkup(html);
		expect(html).not.toContain('onerror');
	});
});

describe('renderScriptMarkdown: hostile input does not survive', () => {
	const hostile: [string, string][] = [
		['script tag', 'Intro <script>alert(1)</script> done'],
		['script tag on its own line', '<script>\nalert(document.cookie)\n</script>'],
		['img with onerror', '<img src=x onerror="alert(1)">'],
		['Markdown link to javascript:', '[x](javascript:alert(1))'],
		['Markdown link to JaVaScRiPt: in mixed case', '[x](JaVaScRiPt:alert(1))'],
		['tab entity inside the scheme', '<a href="jav&#x09;ascript:alert(1)">x</a>'],
		['newline entity inside the scheme', '<a href="java&#x0A;script:alert(1)">x</a>'],
		[
			'decimal entities for the whole scheme',
			'<a href="&#106;&#97;&#118;&#97;&#115;&#99;&#114;&#105;&#112;&#116;&#58;alert(1)">x</a>'
		],
		['leading space and control character', '<a href=" &#x01;javascript:alert(1)">x</a>'],
		['tab entity in a Markdown link', '[x](jav&#x09;ascript:alert(1))'],
		['named entities &Tab; and &colon;', '<a href="java&Tab;script&colon;alert(1)">x</a>'],
		[
			'event handler on a kept link',
			'<a href="https://parts.example" onmouseover="alert(1)">x</a>'
		],
		['vbscript:', '<a href="vbscript:msgbox(1)">x</a>'],
		['data: URL in a link', '[x](data:text/html;base64,PHNjcmlwdD5hbGVydCgxKTwvc2NyaXB0Pg==)'],
		['data: URL in an image', '![x](data:image/svg+xml;base64,PHN2ZyBvbmxvYWQ9YWxlcnQoMSk+)'],
		['iframe', '<iframe src="https://evil.example"></iframe>'],
		['iframe with srcdoc', '<iframe srcdoc="<script>alert(1)</script>"></iframe>'],
		['svg with onload', '<svg onload="alert(1)"><circle r="4"/></svg>'],
		['style attribute', '<p style="background:url(javascript:alert(1))">styled</p>'],
		['style element', '<style>body{display:none}</style>text'],
		['event handler on an allowed tag', '<strong onclick="alert(1)">bold</strong>'],
		['object and embed', '<object data="evil.swf"></object><embed src="evil.swf">'],
		[
			'form and button',
			'<form action="https://evil.example"><button formaction="javascript:alert(1)">go</button></form>'
		],
		['meta refresh', '<meta http-equiv="refresh" content="0;url=javascript:alert(1)">'],
		['math with an href', '<math href="javascript:alert(1)">x</math>'],
		['protocol-relative link', '[x](//evil.example/path)']
	];

	test.each(hostile)('%s', (_name, markdown) => {
		const html = renderScriptMarkdown(markdown);
		expectOnlySafeMarkup(html);
		expect(html.toLowerCase()).not.toMatch(
			/<script|<iframe|<svg|<img|<style|<object|<embed|<form|<meta/
		);
		expect(html.toLowerCase()).not.toMatch(/javascript:|vbscript:|data:/);
		expect(html).not.toMatch(/\son[a-z]+\s*=/i);
	});

	test('a refused link keeps its text as plain text', () => {
		const html = renderScriptMarkdown('[the jack](javascript:alert(1))');
		expect(html).toBe('<p>the jack</p>\n');
	});

	test('script contents are dropped, not shown as text', () => {
		expect(renderScriptMarkdown('<script>alert(1)</script>')).not.toContain('alert');
	});
});

describe('renderScriptMarkdown: ordinary Markdown renders', () => {
	// Expected HTML follows the CommonMark spec 0.31.2 examples (from memory),
	// with our one change: h1 becomes h2 because the page owns h1.
	test('headings: # becomes h2, ## and ### keep their level', () => {
		const html = renderScriptMarkdown('# Rear axle\n\n## Shocks\n\n### Bump stops');
		expect(elementsOf(html).map((element) => element.name)).toEqual(['h2', 'h2', 'h3']);
		expect(html).toContain('<h2>Rear axle</h2>');
		expect(html).toContain('<h3>Bump stops</h3>');
	});

	test('h5 and h6 are kept as h4', () => {
		expect(renderScriptMarkdown('##### Note')).toBe('<h4>Note</h4>\n');
	});

	test('bold, italic and strikethrough', () => {
		expect(renderScriptMarkdown('**bold** *it* ~~old~~')).toBe(
			'<p><strong>bold</strong> <em>it</em> <del>old</del></p>\n'
		);
	});

	test('bullet and numbered lists, including a start number', () => {
		const html = renderScriptMarkdown('- lift\n- level\n\n3. three\n4. four');
		expect(elementsOf(html).map((element) => element.name)).toEqual([
			'ul',
			'li',
			'li',
			'ol',
			'li',
			'li'
		]);
		expect(html).toContain('<ol start="3">');
	});

	test('links keep http, https and mailto hrefs and get rel="noopener noreferrer nofollow"', () => {
		const html = renderScriptMarkdown(
			'[kit](https://parts.example/kit "Lift kit") [old](http://parts.example) [mail](mailto:crew@wrenchroll.example)'
		);
		const links = elementsOf(html).filter((element) => element.name === 'a');
		expect(links.map((link) => link.attribs.href)).toEqual([
			'https://parts.example/kit',
			'http://parts.example',
			'mailto:crew@wrenchroll.example'
		]);
		for (const link of links) expect(link.attribs.rel).toBe('noopener noreferrer nofollow');
		expect(links[0]?.attribs.title).toBe('Lift kit');
		expect(SCRIPT_LINK_REL).toBe('noopener noreferrer nofollow');
	});

	test('a rel written in raw HTML is replaced by ours', () => {
		const html = renderScriptMarkdown('<a href="https://parts.example" rel="opener">kit</a>');
		expect(elementsOf(html).find((element) => element.name === 'a')?.attribs.rel).toBe(
			SCRIPT_LINK_REL
		);
	});

	test('bare URLs are linked (GFM autolink) and get rel too', () => {
		const html = renderScriptMarkdown('see https://parts.example/kit');
		expect(html).toBe(
			`<p>see <a href="https://parts.example/kit" rel="${SCRIPT_LINK_REL}">https://parts.example/kit</a></p>\n`
		);
	});

	test('relative links are refused: scripts link to full addresses', () => {
		expect(renderScriptMarkdown('[notes](/episodes/4)')).toBe('<p>notes</p>\n');
	});

	test('blockquote, code, pre and hr', () => {
		const html = renderScriptMarkdown('> say it slow\n\n`WX-2210`\n\n```\ntorque 95\n```\n\n---');
		expect(elementsOf(html).map((element) => element.name)).toEqual([
			'blockquote',
			'p',
			'p',
			'code',
			'pre',
			'code',
			'hr'
		]);
		// The language class marked adds to fenced code is not needed and is dropped.
		expect(renderScriptMarkdown('```js\nx\n```')).toBe('<pre><code>x\n</code></pre>\n');
	});

	test('tables keep their structure and a valid align value', () => {
		const html = renderScriptMarkdown('| Part | Torque |\n|:--|--:|\n| lug nut | 95 ft-lbs |');
		const names = elementsOf(html).map((element) => element.name);
		expect(names).toEqual(['table', 'thead', 'tr', 'th', 'th', 'tbody', 'tr', 'td', 'td']);
		expect(html).toContain('<th align="left">Part</th>');
		expect(html).toContain('<td align="right">95 ft-lbs</td>');
	});

	test('an invalid align value in raw HTML is dropped', () => {
		expect(
			renderScriptMarkdown('<table><tr><td align="javascript:x">a</td></tr></table>')
		).not.toContain('align');
	});

	test('text that looks like HTML in prose is escaped, not lost', () => {
		expect(renderScriptMarkdown('torque 5 < 10 & more')).toBe(
			'<p>torque 5 &lt; 10 &amp; more</p>\n'
		);
	});

	test('line break and paragraphs', () => {
		expect(renderScriptMarkdown('one  \ntwo\n\nthree')).toBe('<p>one<br />two</p>\n<p>three</p>\n');
	});
});

describe('MAX_SCRIPT_CHARACTERS', () => {
	test('is 100,000 and a 10-minute script fits with room to spare', () => {
		expect(MAX_SCRIPT_CHARACTERS).toBe(100_000);
		// Hand-worked: 10 min × 150 wpm = 1,500 words; at about 6 characters a word
		// with its space (common practice for English prose), ≈ 9,000 characters.
		expect(10 * 150 * 6).toBeLessThan(MAX_SCRIPT_CHARACTERS / 10);
	});

	test('a script at the limit renders; one character over is refused with a message', () => {
		expect(renderScriptMarkdown('a'.repeat(MAX_SCRIPT_CHARACTERS))).toContain('<p>');
		expect(() => renderScriptMarkdown('a'.repeat(MAX_SCRIPT_CHARACTERS + 1))).toThrow(
			/Split it into two segments/
		);
	});
});
