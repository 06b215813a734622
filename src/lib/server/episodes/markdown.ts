/**
 * Script Markdown → safe HTML, on the server only. Scripts are written by
 * crew members but may hold pasted text from anywhere (parts pages, e-mails),
 * so whatever `marked` produces is passed through `sanitize-html` with a short
 * allowlist before it reaches a page. The browser's live preview posts the
 * Markdown to a server route that calls `renderScriptMarkdown`, because
 * shipping a sanitiser to the browser would cost more than the round trip.
 */
import { Marked } from 'marked';
import sanitizeHtml from 'sanitize-html';

/**
 * Our own limit on one segment's script. A 10-minute segment at 150 wpm is
 * about 1,500 words ≈ 9,000 characters, so 100,000 leaves ample room for notes
 * and tables while keeping one render (and one save) cheap.
 */
export const MAX_SCRIPT_CHARACTERS = 100_000;

/** Every link in a rendered script gets this rel: no window.opener, no referrer, no ranking credit. */
export const SCRIPT_LINK_REL = 'noopener noreferrer nofollow';

const allowedLinkSchemes = ['http', 'https', 'mailto'];

// Own instance so another module's marked.use() cannot change script rendering.
const scriptMarked = new Marked({ gfm: true, breaks: false, pedantic: false, async: false });

/**
 * Crew directions in a script, `[[B-roll: hose at droop]]`, are not spoken (the word count skips
 * them too); they render as a marked span so nobody reads them out. Same span as the word counter's
 * pattern: no blank line inside.
 */
scriptMarked.use({
	extensions: [
		{
			name: 'direction',
			level: 'inline',
			start: (src: string) => src.indexOf('[['),
			tokenizer(src: string) {
				const match = /^\[\[((?:(?!\n[ \t]*\n)[\s\S])*?)\]\]/.exec(src);
				if (!match) return undefined;
				return {
					type: 'direction',
					raw: match[0],
					text: match[1],
					tokens: this.lexer.inlineTokens(match[1])
				};
			},
			renderer(token) {
				return `<span class="direction">${this.parser.parseInline(token.tokens ?? [])}</span>`;
			}
		}
	]
});

/**
 * Decides whether an href may stay, the way a browser will read it: the WHATWG
 * URL parser drops leading/trailing C0 controls and spaces and removes tab and
 * newline anywhere, so `jav&#x09;ascript:` (decoded by the HTML parser to
 * "jav\tascript:") is `javascript:` to a browser. We do the same, refuse any
 * other control character, and then require an allowed scheme. Relative and
 * protocol-relative URLs are refused too: a script links out to full addresses.
 */
function cleanedLinkHref(rawHref: string): string | null {
	const href = rawHref.replace(/[\t\n\r]/g, '').replace(/^[\x00-\x20]+|[\x00-\x20]+$/g, '');
	if (/[\x00-\x1f\x7f]/.test(href)) return null;
	const scheme = /^([a-z][a-z0-9+.-]*):/i.exec(href)?.[1]?.toLowerCase();
	return scheme !== undefined && allowedLinkSchemes.includes(scheme) ? href : null;
}

const tableAlignments = ['left', 'center', 'right'];

/** Keeps a table cell's alignment (marked writes it as `align`) only when it is one of the three real values. */
function keepTableAlignment(tagName: string, attribs: sanitizeHtml.Attributes): sanitizeHtml.Tag {
	const align = attribs.align?.trim().toLowerCase();
	return {
		tagName,
		attribs: align !== undefined && tableAlignments.includes(align) ? { align } : {}
	};
}

const sanitizeOptions: sanitizeHtml.IOptions = {
	allowedTags: [
		'p',
		'br',
		'strong',
		'em',
		'del',
		'ul',
		'ol',
		'li',
		'blockquote',
		'h2',
		'h3',
		'h4',
		'code',
		'pre',
		'a',
		'hr',
		'table',
		'thead',
		'tbody',
		'tr',
		'th',
		'td',
		'span'
	],
	allowedAttributes: {
		a: ['href', 'title', 'rel'],
		ol: ['start'],
		th: ['align'],
		td: ['align']
	},
	allowedClasses: { span: ['direction'] },
	allowedStyles: {},
	allowedSchemes: allowedLinkSchemes,
	allowedSchemesByTag: {},
	allowedSchemesAppliedToAttributes: ['href', 'src', 'cite'],
	allowProtocolRelative: false,
	disallowedTagsMode: 'discard',
	// Tags whose content is code or markup, not readable text: drop them with their content.
	nonTextTags: [
		'script',
		'style',
		'textarea',
		'option',
		'noscript',
		'xmp',
		'iframe',
		'template',
		'svg',
		'math',
		'object'
	],
	transformTags: {
		// The page owns h1 (the episode title); script headings start one level down.
		h1: sanitizeHtml.simpleTransform('h2', {}, false),
		h5: sanitizeHtml.simpleTransform('h4', {}, false),
		h6: sanitizeHtml.simpleTransform('h4', {}, false),
		// sanitize-html's own value list leaves an empty `align` behind; keep a valid value or none.
		th: keepTableAlignment,
		td: keepTableAlignment,
		a: (_tagName, attribs) => {
			const href = attribs.href === undefined ? null : cleanedLinkHref(attribs.href);
			if (href === null) {
				// A link we will not keep becomes its text: this tag is not allowed, so it is discarded.
				return { tagName: 'refused-link', attribs: {} };
			}
			const kept: sanitizeHtml.Attributes = { href, rel: SCRIPT_LINK_REL };
			if (attribs.title !== undefined) kept.title = attribs.title;
			return { tagName: 'a', attribs: kept };
		}
	}
};

/** Renders a segment's Markdown script to HTML that is safe to put in a page (marked, then sanitize-html). */
export function renderScriptMarkdown(markdown: string): string {
	if (markdown.length > MAX_SCRIPT_CHARACTERS) {
		throw new RangeError(
			`This script is ${markdown.length.toLocaleString('en')} characters, over the ${MAX_SCRIPT_CHARACTERS.toLocaleString('en')} limit for one segment. Split it into two segments.`
		);
	}
	const html = scriptMarked.parse(markdown, { async: false });
	return sanitizeHtml(html, sanitizeOptions);
}
