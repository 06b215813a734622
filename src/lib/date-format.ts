/**
 * English date formatters, each made once and kept. Making an `Intl.DateTimeFormat` costs about
 * 0.2 ms (and `Date#toLocaleString` with options makes one on every call), so a page that formats
 * a date per row, or builds its formatters on every render, spent milliseconds per request on it.
 * Ask here instead: `dateFormat({ dateStyle: 'medium' }).format(date)`.
 */
const made = new Map<string, Intl.DateTimeFormat>();

/** The `en` formatter for these options, made on first use. */
export function dateFormat(options: Intl.DateTimeFormatOptions): Intl.DateTimeFormat {
	const key = JSON.stringify(options);
	let format = made.get(key);
	if (!format) {
		format = new Intl.DateTimeFormat('en', options);
		made.set(key, format);
	}
	return format;
}
