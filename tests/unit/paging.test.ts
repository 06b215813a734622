/**
 * The keyset cursor ($lib/schemas/paging.ts) and the checks a cursor's values pass before they
 * reach SQL (src/lib/server/http/keyset.ts).
 */
import { describe, expect, test } from 'vitest';
import {
	decodeCursor,
	encodeCursor,
	pageQuerySchema,
	DEFAULT_PAGE_SIZE,
	MAX_PAGE_SIZE
} from '../../src/lib/schemas/paging';
import { keyValueFits } from '../../src/lib/server/http/keyset';

describe('cursor encoding', () => {
	test('is base64url without padding, as RFC 4648 §5 defines it (compared with Node’s Buffer)', () => {
		const keys = ['2027-03-01', 'Ölwechsel “quick” / ±', 'c0ffee00-0000-4000-8000-000000000001'];
		const cursor = encodeCursor('publish:asc', keys);
		// Node's Buffer implements RFC 4648 §5 ('base64url': '-' and '_', no '=' padding).
		expect(cursor).toBe(
			Buffer.from(JSON.stringify({ o: 'publish:asc', k: keys }), 'utf8').toString('base64url')
		);
		expect(cursor).toMatch(/^[A-Za-z0-9_-]+$/);
		expect(decodeCursor(cursor)).toEqual({ order: 'publish:asc', keys });
	});

	test('anything that is not one of our cursors decodes to null', () => {
		const base64url = (value: unknown) =>
			Buffer.from(JSON.stringify(value), 'utf8').toString('base64url');
		for (const text of [
			'',
			'not a cursor',
			'%%%',
			'a'.repeat(1001),
			base64url([1, 2]),
			base64url({ o: 'publish:asc', k: [] }),
			base64url({ o: 1, k: ['x'] }),
			base64url({ o: 'x', k: [{ nested: true }] }),
			base64url({ o: 'x', k: Array(9).fill('a') }),
			Buffer.from([0xff, 0xfe, 0x00]).toString('base64url')
		])
			expect(decodeCursor(text), text.slice(0, 40)).toBeNull();
	});
});

describe('page query', () => {
	test('limit defaults, and is read from text within its bounds', () => {
		expect(pageQuerySchema.parse({})).toEqual({ after: undefined, limit: DEFAULT_PAGE_SIZE });
		expect(pageQuerySchema.parse({ limit: '10' }).limit).toBe(10);
		for (const limit of ['0', String(MAX_PAGE_SIZE + 1), '2.5', 'ten']) {
			const parsed = pageQuerySchema.safeParse({ limit });
			expect(parsed.success).toBe(false);
			expect(parsed.error?.issues[0].path).toEqual(['limit']);
		}
	});

	test('a damaged cursor is an issue on after, in words', () => {
		const parsed = pageQuerySchema.safeParse({ after: 'zz%%' });
		expect(parsed.success).toBe(false);
		expect(parsed.error?.issues[0].path).toEqual(['after']);
		expect(parsed.error?.issues[0].message).toMatch(/first page/);
	});
});

describe('cursor values', () => {
	// What PostgreSQL prints for these types (its documentation, "Date/Time Output", ISO style).
	test('accepts what PostgreSQL prints for each kind of key', () => {
		expect(keyValueFits('date', '2027-03-01')).toBe(true);
		expect(keyValueFits('date', 'infinity')).toBe(true);
		expect(keyValueFits('timestamp', '2026-12-03 11:24:24.123456+00')).toBe(true);
		expect(keyValueFits('timestamp', '2026-12-03 11:24:24+05:30')).toBe(true);
		expect(keyValueFits('integer', '-42')).toBe(true);
		expect(keyValueFits('uuid', 'c0ffee00-0000-4000-8000-000000000001')).toBe(true);
		expect(keyValueFits('text', 'any words at all')).toBe(true);
		// double precision: shortest exact digits, exponent form for large and small values
		// (PostgreSQL documentation, "Floating-Point Types", extra_float_digits).
		for (const printed of ['12.5', '-1', '0', '1e+100', '1.5e-07', 'Infinity', '-Infinity'])
			expect(keyValueFits('float', printed), printed).toBe(true);
	});

	test('refuses values the database would fail to cast', () => {
		// 2027 is not a leap year (Gregorian rule: divisible by 4, not by 100 unless by 400).
		expect(keyValueFits('date', '2027-02-29')).toBe(false);
		expect(keyValueFits('date', 'tomorrow')).toBe(false);
		expect(keyValueFits('timestamp', '2026-12-03 25:00:00+00')).toBe(false);
		expect(keyValueFits('timestamp', '2026-13-03 10:00:00+00')).toBe(false);
		expect(keyValueFits('integer', '1e3')).toBe(false);
		expect(keyValueFits('integer', '9'.repeat(19))).toBe(false);
		expect(keyValueFits('uuid', 'not-an-id')).toBe(false);
		expect(keyValueFits('text', 42)).toBe(false);
		// PostgreSQL's text type refuses the NUL character (its documentation, "Character Types").
		expect(keyValueFits('text', 'a\u0000b')).toBe(false);
		expect(keyValueFits('text', null)).toBe(false);
		// Beyond double precision's range PostgreSQL fails the cast ("out of range"); NaN never sorts
		// a list here.
		for (const value of ['1e999', '-1e999', '1e-999', 'NaN', '12.5x', '1,5', ''])
			expect(keyValueFits('float', value), value).toBe(false);
	});
});
