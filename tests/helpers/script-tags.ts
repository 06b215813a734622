/**
 * The HTML a rendered script may contain, written out here rather than read from the renderer, so
 * the checks hold the renderer to it: paragraphs and breaks, emphasis, lists, quotes, headings 2–4,
 * code, links, rules and tables (GFM), and the span the sanitiser keeps for table alignment.
 */
export const SCRIPT_TAGS: ReadonlySet<string> = new Set([
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
]);
