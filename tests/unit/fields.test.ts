/**
 * The shared field checks match what PostgreSQL stores. References: the PostgreSQL manual,
 * "Character Types" (text cannot hold the character with code zero), "Numeric Types" (`integer`
 * is −2147483648 to +2147483647), "Date/Time Types" (`date` is a Gregorian calendar day); the
 * Unicode Standard's general category Cc for control characters (U+0000–U+001F, U+007F–U+009F);
 * and ECMAScript's `Date.UTC`, which rolls an impossible day over into the next month, as the
 * calendar to compare with. tests/integration/stored-input.test.ts asks the real database too.
 */
import fc from 'fast-check';
import { describe, expect, test } from 'vitest';
import { z } from 'zod';
import {
	DATE_YEARS,
	INT_MAX,
	INT_MIN,
	calendarDate,
	dateProblem,
	text,
	textProblem,
	recordVersion,
	wholeNumber
} from '$lib/schemas/fields';
import { importRequestSchema } from '$lib/schemas/parts';
import { specCardInputSchema } from '$lib/specs';

const schemaModules = import.meta.glob('../../src/lib/schemas/*.ts', { eager: true }) as Record<
	string,
	Record<string, unknown>
>;

describe('text', () => {
	const field = text('Give it a title.').trim().max(20);

	test('refuses every control character but tab and newline, beside the field', () => {
		// Unicode category Cc: U+0000–U+001F and U+007F–U+009F.
		const controls = [
			...Array.from({ length: 0x20 }, (_, code) => code),
			...Array.from({ length: 0x21 }, (_, index) => 0x7f + index)
		];
		for (const code of controls) {
			const parsed = field.safeParse(`a${String.fromCharCode(code)}b`);
			if (code === 0x09 || code === 0x0a || code === 0x0d) expect(parsed.success).toBe(true);
			else {
				expect(parsed.success, `U+${code.toString(16).padStart(4, '0')}`).toBe(false);
				expect(parsed.error!.issues[0].message).toMatch(/invisible control character/);
			}
		}
	});

	test('reads CR LF and a lone CR as a newline', () => {
		expect(field.parse('one\r\ntwo\rthree')).toBe('one\ntwo\nthree');
		expect(field.parse('\ttab\tstays')).toBe('tab\tstays');
	});

	test('refuses half of a surrogate pair and keeps whole ones, marks and right-to-left text', () => {
		expect(textProblem('wheel \ud83d')).toMatch(/broken character/);
		expect(textProblem('\udc27 lug')).toMatch(/broken character/);
		expect(textProblem('🔧 lug nut')).toBeNull();
		expect(textProblem('\u202eright to left\u202c and \u200f marks')).toBeNull();
		expect(textProblem('é and e\u0301')).toBeNull();
	});

	test('says which field in a CSV row', () => {
		expect(textProblem('A\u0000', 'SKU')).toMatch(/^SKU has an invisible control character/);
	});

	test('refuses what is not text with the field’s own words', () => {
		expect(field.safeParse(42).error!.issues[0].message).toBe('Give it a title.');
	});
});

describe('whole numbers', () => {
	test('stop at the edges of a PostgreSQL integer', () => {
		expect(INT_MAX).toBe(2_147_483_647);
		expect(INT_MIN).toBe(-2_147_483_648);
		const any = wholeNumber({ error: 'A number.' });
		expect(any.safeParse(INT_MAX).success).toBe(true);
		expect(any.safeParse(INT_MIN).success).toBe(true);
		expect(any.safeParse(INT_MAX + 1).success).toBe(false);
		expect(any.safeParse(INT_MIN - 1).success).toBe(false);
		expect(any.safeParse(2 ** 53).success).toBe(false);
		expect(any.safeParse(1.5).success).toBe(false);
	});

	test('a field’s own limit can only be narrower than the column', () => {
		const wide = wholeNumber({ error: 'A number.', min: -1e12, max: 1e12 });
		expect(wide.safeParse(2 ** 31).success).toBe(false);
		expect(wide.safeParse(-(2 ** 31) - 1).success).toBe(false);
	});

	test('a version is a whole number from 1, typed or sent, and says to reload when it is not', () => {
		const version = recordVersion;
		expect(version.parse('7')).toBe(7);
		for (const bad of ['0', '-1', '1.5', '', 'x', String(2 ** 31), 'Infinity'])
			expect(version.safeParse(bad).error?.issues[0].message, bad).toMatch(/reload the page/i);
	});
});

describe('calendar dates', () => {
	const pad = (value: number, width: number) => String(value).padStart(width, '0');
	/** The calendar reference: Date.UTC moves an impossible day into the next month, so a real day comes back as typed. */
	const onCalendar = (year: number, month: number, day: number) => {
		const back = new Date(Date.UTC(year, month - 1, day));
		return (
			back.getUTCFullYear() === year &&
			back.getUTCMonth() === month - 1 &&
			back.getUTCDate() === day
		);
	};

	test('accept exactly the days Date.UTC finds on the calendar, between 1900 and 2200', () => {
		fc.assert(
			fc.property(
				fc.integer({ min: DATE_YEARS.min, max: DATE_YEARS.max }),
				fc.integer({ min: 0, max: 13 }),
				fc.integer({ min: 0, max: 32 }),
				(year, month, day) => {
					const typed = `${pad(year, 4)}-${pad(month, 2)}-${pad(day, 2)}`;
					expect(dateProblem(typed) === null).toBe(onCalendar(year, month, day));
				}
			),
			{ seed: 20_270_214, numRuns: 3_000 }
		);
	});

	test('know the leap years of the Gregorian calendar', () => {
		// Every 4th year, except centuries, except every 400th: 1900 and 2100 are not, 2000 is.
		expect(dateProblem('2028-02-29')).toBeNull();
		expect(dateProblem('2000-02-29')).toBeNull();
		expect(dateProblem('1900-02-29')).toMatch(/February 1900 has 28 days/);
		expect(dateProblem('2100-02-29')).toMatch(/February 2100 has 28 days/);
		expect(dateProblem('2027-02-31')).toBe(
			'2027-02-31 is not on the calendar: February 2027 has 28 days.'
		);
		expect(dateProblem('2027-04-31')).toMatch(/April 2027 has 30 days/);
		expect(dateProblem('2027-13-01')).toMatch(/months go from 01 to 12/);
	});

	test('refuse years outside 1900–2200, year 0 included (PostgreSQL has no year 0)', () => {
		for (const typed of ['0000-01-01', '1899-12-31', '2201-01-01', '9999-12-31'])
			expect(dateProblem(typed)).toMatch(/between 1900 and 2200/);
	});

	test('take only YYYY-MM-DD and say so in the field’s words', () => {
		const date = calendarDate('Pick a date.');
		expect(date.parse(' 2027-03-14 ')).toBe('2027-03-14');
		for (const typed of ['2027-3-14', '14/03/2027', '2027-03-14T00:00', '+2027-03-14', ''])
			expect(date.safeParse(typed).error?.issues[0].message, typed).toBe('Pick a date.');
		expect(calendarDate('Pick a date.', { allowEmpty: true }).parse('')).toBe('');
	});
});

/** The fields of every exported object schema under src/lib/schemas, and of each kind of spec card. */
function objectFields(): { where: string; key: string; schema: z.ZodType }[] {
	const found: { where: string; key: string; schema: z.ZodType }[] = [];
	const visit = (where: string, schema: unknown) => {
		if (schema instanceof z.ZodObject)
			for (const [key, field] of Object.entries(schema.shape))
				found.push({ where, key, schema: field as z.ZodType });
	};
	for (const [file, exports] of Object.entries(schemaModules))
		for (const [name, value] of Object.entries(exports))
			visit(`${file.split('/').pop()} ${name}`, value);
	for (const option of specCardInputSchema.options) visit('spec card input', option);
	return found;
}

/** Fields that take any character on purpose. */
const ANY_CHARACTER: Record<string, string> = {
	password: 'passwords are hashed, never stored as text',
	currentPassword: 'passwords are only compared with their hash, never stored',
	confirm: 'passwords are hashed, never stored as text',
	csv: 'the file is read cell by cell, and every stored cell is checked as text'
};

describe('every schema', () => {
	const fields = objectFields();

	test('is found', () => {
		expect(fields.length).toBeGreaterThan(100);
	});

	test('refuses a NUL character in every field', () => {
		const open = fields.filter(({ key, schema }) => {
			if (ANY_CHARACTER[key]) return false;
			const nul = 'Bay\u00003';
			return [nul, [nul]].some((probe) => schema.safeParse(probe).success);
		});
		expect(open.map(({ where, key }) => `${where}.${key}`)).toEqual([]);
		// The one record of text: a CSV import's column names.
		const mapping = importRequestSchema.shape.mapping;
		expect(mapping.safeParse({ sku: 'SKU\u0000' }).success).toBe(false);
		expect(mapping.safeParse({ sku: 'SKU' }).success).toBe(true);
	});

	test('refuses 2^31 in every field', () => {
		// Only fields that take a number (text may hold digits); a spec card's figures are stored in
		// jsonb, not an integer column, and the spec renderer refuses absurd ones in words.
		const numbers = fields.filter(
			({ where, schema }) => where !== 'spec card input' && schema.safeParse(1).success
		);
		expect(numbers.length).toBeGreaterThan(20);
		const open = numbers.filter(({ schema }) =>
			[2 ** 31, String(2 ** 31), -(2 ** 31) - 1].some((probe) => schema.safeParse(probe).success)
		);
		expect(open.map(({ where, key }) => `${where}.${key}`)).toEqual([]);
	});
});
