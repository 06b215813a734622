/**
 * The field checks every schema builds on, so what a form or an API call may send is what the
 * database stores: text without control characters, whole numbers that fit a PostgreSQL `integer`
 * column, and dates that exist on the calendar. Shared by the browser and the server.
 *
 * Text: PostgreSQL refuses the NUL character in `text` (and `\u0000` in `jsonb`); the other control
 * characters only garble pages, exports and subtitles, so they are refused too, with a message next
 * to the field. Tab and newline are ordinary text. Windows line ends (CR LF) and lone CRs are read
 * as a newline rather than refused: they arrive with every paste from some editors and mean nothing
 * else. Half of a UTF-16 surrogate pair (a broken emoji) cannot be stored as UTF-8 and is refused.
 */
import { z } from 'zod';

// Zod compiles object parsers with `new Function` where it may, and probes for that when the first
// schema is built. A page's Content-Security-Policy allows no eval (svelte.config.js), so in the
// browser the probe would be refused and reported as a violation: tell Zod not to try. Every schema
// module imports this one first, so this runs before any schema exists. (It lives here rather than in
// hooks.client.ts so that pages without a schema are not sent Zod at all.)
if (typeof window !== 'undefined') z.config({ jitless: true });

/** PostgreSQL `integer`: −2^31 … 2^31 − 1. */
export const INT_MIN = -(2 ** 31);
export const INT_MAX = 2 ** 31 - 1;

/** The most frames any time in a cut may count (typed as timecode or sent as a number). */
export { MAX_FRAMES } from '../timecode';

/** Calendar years a date field accepts: wide enough for any model year or schedule. */
export const DATE_YEARS = { min: 1900, max: 2200 } as const;

/** C0 controls except tab (09) and newline (0A), DEL, and the C1 controls (Unicode category Cc). */
const CONTROL_CHARACTER = /[\u0000-\u0008\u000B-\u001F\u007F-\u009F]/;
const LONE_SURROGATE = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;

/** CR LF and a lone CR become LF, as a browser's textarea sends them anyway. */
export const normaliseNewlines = (value: string) => value.replace(/\r\n?/g, '\n');

/**
 * Why this text can't be stored as it is, in the crew's words, or null when it can. `subject` starts
 * the sentence: "This" beside a form field, a column's name in a CSV row.
 */
export function textProblem(value: string, subject = 'This'): string | null {
	if (CONTROL_CHARACTER.test(normaliseNewlines(value)))
		return `${subject} has an invisible control character in it (it often comes along with pasted text): delete it or type it again.`;
	if (LONE_SURROGATE.test(value))
		return `${subject} has a broken character in it (half of an emoji or symbol): delete it or type it again.`;
	return null;
}

/**
 * Text the database can store: newlines normalised, control and broken characters refused. Chain
 * the field's own rules after it: `text('Give it a title.').trim().min(1, …).max(120, …)`.
 */
export function text(error?: string) {
	return z
		.string(error ? { error } : undefined)
		.overwrite(normaliseNewlines)
		.check((context) => {
			const problem = textProblem(context.value);
			if (problem) context.issues.push({ code: 'custom', message: problem, input: context.value });
		});
}

export interface WholeNumberRules {
	/** Said when the value is missing or not a number at all. */
	error: string;
	/** Said when it has a fraction; defaults to `error`. */
	notWhole?: string;
	min?: number;
	max?: number;
	tooSmall?: string;
	tooBig?: string;
	/** Read numbers typed as text too (form fields, query strings). */
	coerce?: boolean;
}

/** A whole number inside the field's own limits, and never outside a PostgreSQL `integer`. */
export function wholeNumber(rules: WholeNumberRules) {
	const min = Math.max(rules.min ?? INT_MIN, INT_MIN);
	const max = Math.min(rules.max ?? INT_MAX, INT_MAX);
	const base = rules.coerce
		? z.coerce.number({ error: rules.error })
		: z.number({ error: rules.error });
	return base
		.int(rules.notWhole ?? rules.error)
		.min(min, rules.tooSmall ?? `Enter ${min.toLocaleString('en')} or more.`)
		.max(max, rules.tooBig ?? `That is more than ${max.toLocaleString('en')}: check the number.`);
}

/**
 * The version of a record the person read, for the optimistic lock: a whole number from 1. The one
 * version schema of every form and API body. A form sends it as text ("3"), JSON as a number; an
 * empty, missing or non-number value is "missing" (no coercion of `true` or `null` into a number).
 */
export const recordVersion = z.preprocess(
	(value) => (typeof value === 'string' && value.trim() !== '' ? Number(value) : value),
	wholeNumber({
		error: 'The version is missing. Reload the page and try again.',
		min: 1,
		tooSmall: 'The version is missing. Reload the page and try again.',
		tooBig: 'That is not a version this record ever had: reload the page and try again.'
	})
);

const DAY_PATTERN = /^(\d{4})-(\d{2})-(\d{2})$/;
const MONTHS = [
	'January',
	'February',
	'March',
	'April',
	'May',
	'June',
	'July',
	'August',
	'September',
	'October',
	'November',
	'December'
];

/** The days in a month of the Gregorian calendar (`Date.UTC` rolls day 0 back to the month before's last day). */
const daysInMonth = (year: number, month: number) =>
	new Date(Date.UTC(year, month, 0)).getUTCDate();

/**
 * Why `YYYY-MM-DD` is not a day the database can store, or null when it is: the text must name a
 * real day of the Gregorian calendar (as PostgreSQL's `date` and `Date.UTC` count them) between
 * DATE_YEARS.min and DATE_YEARS.max.
 */
export function dateProblem(
	value: string,
	format = 'Enter the date as YYYY-MM-DD, e.g. 2027-03-14.'
): string | null {
	const match = DAY_PATTERN.exec(value);
	if (!match) return format;
	const [year, month, day] = match.slice(1).map(Number);
	if (year < DATE_YEARS.min || year > DATE_YEARS.max)
		return `Pick a date between ${DATE_YEARS.min} and ${DATE_YEARS.max}.`;
	if (month < 1 || month > 12) return `${value} has month ${match[2]}; months go from 01 to 12.`;
	const last = daysInMonth(year, month);
	if (day < 1 || day > last)
		return `${value} is not on the calendar: ${MONTHS[month - 1]} ${year} has ${last} days.`;
	return null;
}

/**
 * A calendar day typed as `YYYY-MM-DD` (what `<input type="date">` sends). `error` is said when it
 * is missing or unreadable; with `allowEmpty`, '' passes (for "no date yet").
 */
export function calendarDate(
	error = 'Enter the date as YYYY-MM-DD, e.g. 2027-03-14.',
	{ allowEmpty = false }: { allowEmpty?: boolean } = {}
) {
	return z
		.string({ error })
		.trim()
		.check((context) => {
			if (allowEmpty && context.value === '') return;
			const problem = dateProblem(context.value, error);
			if (problem) context.issues.push({ code: 'custom', message: problem, input: context.value });
		});
}

/** A form or body that carries only the version it read (a removal, an approval). */
export const versionOnlySchema = z.object({ version: recordVersion });
