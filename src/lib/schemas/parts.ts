/**
 * Shapes for the parts catalogue, its CSV import, segment notes and the publish kit: shared by the
 * API routes, the pages' form actions and their clients. The field readers (price, store URL,
 * status, currency) are the same for a typed form, a JSON call and a CSV row, so a value accepted
 * in one is accepted in all three.
 */
import { pageQueryFields } from './paging';
import { z } from 'zod';
import {
	MAX_FRAMES,
	normaliseNewlines,
	text,
	textProblem,
	recordVersion,
	wholeNumber
} from './fields';

import {
	PART_STATUSES,
	PART_SORTS,
	MAX_PART_PAGE_SIZE,
	PART_LIMITS,
	MAX_PRICE_CENTS,
	IMPORT_FIELDS,
	type PartStatusValue
} from './parts-constants';
// The constants live apart from zod so pages can import them without it (DEVELOPERS "JavaScript budget").
export * from './parts-constants';

export type FieldReading<T> = { ok: true; value: T } | { ok: false; message: string };

const quote = (text: string) => `“${text.length > 60 ? `${text.slice(0, 57)}…` : text}”`;

/**
 * Price text → whole cents without floating point: `119`, `119.5`, `119.00`, `1,299.00`, `$119.00`.
 * Dot for the cents (at most two digits); commas only as thousands separators.
 */
export function readPrice(input: string | number): FieldReading<number> {
	const text = String(input)
		.trim()
		.replace(/^\$\s*/, '');
	const match = /^(\d{1,3}(?:,\d{3})+|\d+)(?:\.(\d{1,2}))?$/.exec(text);
	if (!match) {
		return {
			ok: false,
			message: `price ${quote(String(input))} isn't a price: write it like 119.00 (digits, a dot before the cents).`
		};
	}
	const whole = Number(match[1].replace(/,/g, ''));
	const cents = Number((match[2] ?? '').padEnd(2, '0'));
	const total = whole * 100 + cents;
	if (!Number.isSafeInteger(total) || total > MAX_PRICE_CENTS) {
		return {
			ok: false,
			message: `price ${quote(String(input))} is far too high for a part; check the column.`
		};
	}
	return { ok: true, value: total };
}

/** A shop page: an absolute http(s) address, read with the WHATWG URL parser. */
export function readStoreUrl(input: string): FieldReading<string> {
	const text = String(input).trim();
	if (text === '')
		return {
			ok: false,
			message: 'store URL is empty: give the address of the part’s shop page (https://…).'
		};
	if (text.length > PART_LIMITS.storeUrl)
		return { ok: false, message: `store URL is longer than ${PART_LIMITS.storeUrl} characters.` };
	let url: URL;
	try {
		url = new URL(text);
	} catch {
		return {
			ok: false,
			message: `store URL ${quote(text)} isn't a web address: it has to start with https:// or http://.`
		};
	}
	if (url.protocol !== 'https:' && url.protocol !== 'http:') {
		return {
			ok: false,
			message: `store URL ${quote(text)} isn't a web page address: only https:// and http:// links work in a description.`
		};
	}
	if (/\s/.test(text))
		return {
			ok: false,
			message: `store URL ${quote(text)} has spaces in it; a web address has none.`
		};
	const problem = textProblem(text, 'store URL');
	if (problem) return { ok: false, message: problem };
	return { ok: true, value: text };
}

/** Status words as the crew would type them in a sheet: "active", "discontinued", "out of stock". */
export function readStatus(input: string | undefined): FieldReading<PartStatusValue> {
	const text = String(input ?? '')
		.trim()
		.toLowerCase()
		.replace(/[\s-]+/g, '_');
	if (text === '') return { ok: true, value: 'active' };
	if ((PART_STATUSES as readonly string[]).includes(text))
		return { ok: true, value: text as PartStatusValue };
	return {
		ok: false,
		message: `status ${quote(String(input))} isn't one of active, discontinued or out of stock.`
	};
}

/** A three-letter currency code (the ISO 4217 alphabetic form); empty means USD. */
export function readCurrency(input: string | undefined): FieldReading<string> {
	const text = String(input ?? '')
		.trim()
		.toUpperCase();
	if (text === '') return { ok: true, value: 'USD' };
	if (/^[A-Z]{3}$/.test(text)) return { ok: true, value: text };
	return {
		ok: false,
		message: `currency ${quote(String(input))} isn't a three-letter currency code such as USD or EUR.`
	};
}

/** Text with a length limit; control and broken characters are refused (not stripped), line ends normalised. */
export function readText(
	field: string,
	input: string | undefined,
	limit: number,
	required = true
): FieldReading<string> {
	const text = normaliseNewlines(String(input ?? '')).trim();
	if (text === '')
		return required ? { ok: false, message: `${field} is empty.` } : { ok: true, value: '' };
	if ([...text].length > limit)
		return { ok: false, message: `${field} is longer than ${limit} characters.` };
	const problem = textProblem(text, field);
	if (problem) return { ok: false, message: problem };
	return { ok: true, value: text };
}

function fieldOf<T>(reader: (value: string) => FieldReading<T>) {
	return z.string({ error: 'This field is text.' }).transform((value, context) => {
		const reading = reader(value);
		if (reading.ok) return reading.value;
		// Messages start with the field's name for CSV rows; a form shows them beside the field.
		context.addIssue({
			code: 'custom',
			message: reading.message.charAt(0).toUpperCase() + reading.message.slice(1)
		});
		return z.NEVER;
	});
}

const partFields = {
	sku: fieldOf((value) => readText('SKU', value, PART_LIMITS.sku)),
	name: fieldOf((value) => readText('name', value, PART_LIMITS.name)),
	category: fieldOf((value) => readText('category', value, PART_LIMITS.category)),
	brand: fieldOf((value) => readText('brand', value, PART_LIMITS.brand)),
	price: z
		.union([z.string(), z.number()], { error: 'Give a price like 119.00.' })
		.transform((value, context) => {
			const reading = readPrice(value);
			if (reading.ok) return reading.value;
			context.addIssue({
				code: 'custom',
				message: reading.message.charAt(0).toUpperCase() + reading.message.slice(1)
			});
			return z.NEVER;
		}),
	currency: fieldOf(readCurrency),
	storeUrl: fieldOf(readStoreUrl),
	fitmentNote: fieldOf((value) => readText('fitment note', value, PART_LIMITS.fitmentNote, false)),
	status: fieldOf(readStatus)
};

/** A new catalogue part; `price` is text or a number of currency units, stored as cents. */
export const partCreateSchema = z
	.object({
		sku: partFields.sku,
		name: partFields.name,
		category: partFields.category,
		brand: partFields.brand,
		price: partFields.price,
		currency: partFields.currency.optional(),
		storeUrl: partFields.storeUrl,
		fitmentNote: partFields.fitmentNote.optional(),
		status: partFields.status.optional()
	})
	.strict();

export const partUpdateSchema = z
	.object({
		version: recordVersion,
		sku: partFields.sku.optional(),
		name: partFields.name.optional(),
		category: partFields.category.optional(),
		brand: partFields.brand.optional(),
		price: partFields.price.optional(),
		currency: partFields.currency.optional(),
		storeUrl: partFields.storeUrl.optional(),
		fitmentNote: partFields.fitmentNote.optional(),
		status: partFields.status.optional()
	})
	.strict();

export type PartCreate = z.infer<typeof partCreateSchema>;
export type PartUpdate = z.infer<typeof partUpdateSchema>;

const emptyToUndefined = (value: unknown) => (value === '' || value === null ? undefined : value);

/** The catalogue list's query string: `?q=&category=&status=&sort=&dir=&page=&pageSize=`. */
export const partSearchSchema = z.object({
	q: z.preprocess(
		emptyToUndefined,
		text().trim().max(100, 'Search for 100 characters or fewer.').optional()
	),
	category: z.preprocess(
		emptyToUndefined,
		text()
			.trim()
			.max(PART_LIMITS.category, `A category has at most ${PART_LIMITS.category} characters.`)
			.optional()
	),
	status: z.preprocess(
		emptyToUndefined,
		z.enum(PART_STATUSES, { error: 'Status is active, discontinued or out_of_stock.' }).optional()
	),
	sort: z.preprocess(
		emptyToUndefined,
		z.enum(PART_SORTS, { error: `Sort by one of ${PART_SORTS.join(', ')}.` }).default('sku')
	),
	dir: z.preprocess(
		emptyToUndefined,
		z.enum(['asc', 'desc'], { error: 'dir is asc or desc.' }).default('asc')
	),
	page: z.preprocess(
		emptyToUndefined,
		wholeNumber({
			error: 'page is a whole number.',
			coerce: true,
			min: 1,
			max: 100_000,
			tooSmall: 'page starts at 1.'
		}).default(1)
	),
	pageSize: z.preprocess(
		emptyToUndefined,
		wholeNumber({
			error: 'pageSize is a whole number.',
			coerce: true,
			min: 1,
			max: MAX_PART_PAGE_SIZE,
			tooSmall: 'pageSize is 1 or more.',
			tooBig: `pageSize is at most ${MAX_PART_PAGE_SIZE}.`
		}).default(25)
	),
	/** The `next` of the previous answer: the page after its last part (`page` then only numbers it). */
	after: pageQueryFields.after
});
export type PartSearch = z.infer<typeof partSearchSchema>;

/** Largest CSV text accepted in one import (about 100,000 typical rows). */
export const MAX_IMPORT_CHARACTERS = 30 * 1024 * 1024;

export const importRequestSchema = z
	.object({
		action: z.enum(['preview', 'commit'], { error: 'action is preview or commit.' }),
		mode: z.enum(['create', 'update'], {
			error: 'mode is create (new parts only) or update (by SKU).'
		}),
		csv: z
			.string({ error: 'Send the file’s text in csv.' })
			.max(MAX_IMPORT_CHARACTERS, 'That file is too big for one import; split it.'),
		/** Wrenchroll field → the file's column header (null: not in the file). Omitted: guessed from the headers. */
		mapping: z
			.partialRecord(
				z.enum(IMPORT_FIELDS),
				text().max(200, 'A column name has at most 200 characters.').nullable()
			)
			.optional()
	})
	.strict();
export type ImportRequest = z.infer<typeof importRequestSchema>;

const uuidList = z
	.array(z.uuid({ error: 'Each part is named by its id.' }), {
		error: 'partIds is a list of part ids.'
	})
	.max(50, 'A note shows at most 50 parts.');
const timeText = text('Type a timecode or a clock time, e.g. 00:04:05;00 or 4:05.')
	.trim()
	.max(40, 'That time is far too long.');
const frameNumber = wholeNumber({
	error: 'A frame is a whole number.',
	min: 0,
	max: MAX_FRAMES,
	tooSmall: 'A frame is 0 or more.',
	tooBig: 'That frame is far past any cut.'
});
const noteText = text('Write what is on screen.')
	.trim()
	.min(1, 'Write what is on screen.')
	.max(2000, 'Keep a note under 2,000 characters.');

/** A new note. Who may set what: camera (text, segment, take, source time), editor (program time), merch (parts). */
export const noteCreateSchema = z
	.object({
		text: noteText,
		segmentId: z.uuid({ error: 'segmentId is the id of a segment.' }).nullable().optional(),
		takeId: z.uuid({ error: 'takeId is the id of a take.' }).nullable().optional(),
		sourceTime: timeText.nullable().optional(),
		sourceFrame: frameNumber.nullable().optional(),
		programTime: timeText.nullable().optional(),
		programFrame: frameNumber.nullable().optional(),
		partIds: uuidList.optional()
	})
	.strict();

export const noteUpdateSchema = noteCreateSchema
	.extend({
		version: recordVersion,
		text: noteText.optional()
	})
	.strict();

/**
 * The notes page's forms also send the take picker's text: a clip name the server resolves to a
 * take of the episode when no take was picked from the list (always so without JavaScript).
 */
const takeClipField = {
	takeClip: text('Type the clip name of the take.')
		.trim()
		.max(120, 'A clip name is at most 120 characters.')
		.optional()
};
export const noteCreateFormSchema = noteCreateSchema.extend(takeClipField).strict();
export const noteUpdateFormSchema = noteUpdateSchema.extend(takeClipField).strict();

export type NoteCreate = z.infer<typeof noteCreateSchema>;
export type NoteUpdate = z.infer<typeof noteUpdateSchema>;

export const KIT_FORMATS = ['md', 'txt', 'json'] as const;
export type KitFormat = (typeof KIT_FORMATS)[number];
export const kitFormatSchema = z.enum(KIT_FORMATS, {
	error: 'Ask for the publish kit as md, txt or json.'
});
