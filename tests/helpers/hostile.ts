/**
 * Hostile input for the fuzz tests, as fast-check arbitraries: the values people paste, tools send
 * and attackers try. Each family names why it is here; the database facts are PostgreSQL's own
 * (its manual: "Character Types" refuses the NUL character in text; "Numeric Types" gives integer
 * −2147483648 to +2147483647; "Date/Time Types" and `Date.UTC` say which calendar days exist).
 */
import fc from 'fast-check';

/** 2^31: the first whole number a PostgreSQL `integer` column cannot hold. */
export const INT_OVERFLOW = 2 ** 31;

/** Strings the database or the parsers have choked on, or might: control characters, broken UTF-16, odd times and dates. */
export const NASTY_STRINGS = [
	'\u0000',
	'a\u0000b',
	'Bay 3\u0000',
	'\ud800',
	'x\udfffy',
	'\ud83d',
	'\u202eRTL override',
	'\u200f\u200eMarks',
	'\u0007bell',
	'\u001b[31mred',
	'\u007f',
	'\u0085',
	'\ufeffBOM',
	'\u2028line\u2029',
	'line one\r\nline two',
	'\r',
	'\t',
	'',
	' ',
	'   \n  ',
	'2027-02-31',
	'2027-02-29',
	'0000-01-01',
	'9999-12-31',
	'1899-12-31',
	'2027-13-01',
	'2027-00-10',
	'+275760-09-13',
	'2027-1-1',
	'12:00',
	'25:61',
	'24:00',
	'NaN',
	'Infinity',
	'-Infinity',
	'-0',
	'1e400',
	'0x7fffffff',
	'2147483648',
	'-2147483649',
	'99999999999999999999',
	'99999999:00',
	'596523:14:08;00',
	'9999:59:59;29',
	'23:59:59;29',
	'00:00:00:00',
	'01:00:04;00',
	'-1:30',
	'1:30',
	'1m30s',
	'285/70R17',
	'999/999R99',
	'0/0R0',
	'https://shop.example.test/p/1',
	'javascript:alert(1)',
	'http://',
	"'; DROP TABLE episode; --",
	'%00',
	'../../etc/passwd',
	'<script>alert(1)</script>',
	'{"a":1}',
	'__proto__',
	'constructor',
	'true',
	'null',
	'00000000-0000-0000-0000-000000000000',
	'not-a-uuid',
	'🔧🚗',
	'e\u0301\u0301\u0301'
] as const;

/** Any UTF-16 code unit, lone surrogates and control characters included. */
const anyCodeUnit = fc.integer({ min: 0, max: 0xffff }).map((code) => String.fromCharCode(code));

export const hostileString: fc.Arbitrary<string> = fc.oneof(
	{ weight: 5, arbitrary: fc.constantFrom(...NASTY_STRINGS) },
	{ weight: 2, arbitrary: fc.string({ unit: anyCodeUnit, maxLength: 24 }) },
	{ weight: 1, arbitrary: fc.string({ unit: 'binary-ascii', maxLength: 24 }) },
	{ weight: 1, arbitrary: fc.string({ unit: 'grapheme', maxLength: 12 }) },
	{
		weight: 1,
		arbitrary: fc.constantFrom(
			'x'.repeat(100_000),
			'a\u0000'.repeat(5_000),
			'_a'.repeat(2_000),
			'1'.repeat(400),
			'\ud800'.repeat(1_000)
		)
	}
);

export const hostileNumber: fc.Arbitrary<number> = fc.oneof(
	{
		weight: 4,
		arbitrary: fc.constantFrom(
			INT_OVERFLOW,
			INT_OVERFLOW - 1,
			-INT_OVERFLOW,
			-INT_OVERFLOW - 1,
			2 ** 32,
			2 ** 53,
			2 ** 53 + 2,
			1e308,
			-1e308,
			5e-324,
			0,
			-0,
			-1,
			1,
			0.5,
			1.5,
			-0.0001,
			2_000_000_000,
			21_600,
			999_999_999_999
		)
	},
	{ weight: 2, arbitrary: fc.integer() },
	{ weight: 1, arbitrary: fc.double({ noNaN: true, noDefaultInfinity: true }) }
);

/** Objects and arrays nested far deeper than any form. */
const deep = (depth: number, array: boolean): unknown => {
	let value: unknown = 'bottom';
	for (let level = 0; level < depth; level += 1) value = array ? [value] : { a: value };
	return value;
};

export const hostileOther: fc.Arbitrary<unknown> = fc.constantFrom(
	null,
	true,
	false,
	[],
	{},
	[1, 2, 3],
	['\u0000'],
	{ nested: { deeper: ['x'] } },
	deep(500, false),
	deep(500, true),
	Array.from({ length: 5_000 }, (_, index) => index),
	JSON.parse('{"__proto__": {"polluted": true}}'),
	{ constructor: { prototype: { polluted: true } } }
);

export const hostileValue: fc.Arbitrary<unknown> = fc.oneof(
	{ weight: 5, arbitrary: hostileString },
	{ weight: 3, arbitrary: hostileNumber },
	{ weight: 2, arbitrary: hostileOther }
);

/** A hostile value, or a plausible one of the same family as the given valid value. */
function near(valid: unknown): fc.Arbitrary<unknown> {
	if (typeof valid === 'number')
		return fc.oneof(hostileNumber, fc.constant(String(valid)), hostileValue);
	if (typeof valid === 'string')
		return fc.oneof(
			hostileString,
			fc.constant(valid + '\u0000'),
			fc.constant(valid.repeat(50)),
			hostileValue
		);
	return hostileValue;
}

/**
 * A body shaped like a valid one with some fields made hostile, dropped or added: deep enough to
 * pass the first checks and reach the later ones.
 */
export function mutated(
	valid: unknown,
	extraKeys: readonly string[],
	depth = 0
): fc.Arbitrary<unknown> {
	if (Array.isArray(valid) && depth < 3) {
		return fc.oneof(
			fc.constant(valid),
			fc.tuple(...valid.map((item) => mutated(item, extraKeys, depth + 1))),
			fc.array(hostileValue, { maxLength: 4 })
		);
	}
	if (valid && typeof valid === 'object' && depth < 3) {
		const entries = Object.entries(valid as Record<string, unknown>);
		const field = ([key, value]: [string, unknown]) =>
			fc
				.oneof(
					{ weight: 6, arbitrary: fc.constant({ keep: true, value }) },
					{
						weight: 3,
						arbitrary: mutated(value, extraKeys, depth + 1).map((v) => ({ keep: true, value: v }))
					},
					{ weight: 1, arbitrary: fc.constant({ keep: false, value: undefined as unknown }) }
				)
				.map((choice) => [key, choice] as const);
		return fc
			.tuple(
				fc.tuple(...entries.map(field)),
				fc.option(
					fc.tuple(fc.constantFrom(...extraKeys, 'isAdmin', 'channelId', 'id'), hostileValue),
					{
						freq: 5
					}
				)
			)
			.map(([fields, extra]) => {
				const body: Record<string, unknown> = {};
				for (const [key, choice] of fields) if (choice.keep) body[key] = choice.value;
				if (extra) body[extra[0]] = extra[1];
				return body;
			});
	}
	return fc.oneof(
		{ weight: 1, arbitrary: fc.constant(valid) },
		{ weight: 3, arbitrary: near(valid) }
	);
}

/** An object of known field names with hostile values: for a route the fuzz has no valid body for. */
export function hostileObject(keys: readonly string[]): fc.Arbitrary<Record<string, unknown>> {
	return fc.dictionary(fc.constantFrom(...keys), hostileValue, { maxKeys: 6 });
}

/** Text that is not a JSON document at all. */
export const notJson = fc.constantFrom(
	'',
	'{"title": "half',
	'\u0000',
	'{"a":1}{"b":2}',
	'[',
	'undefined',
	'NaN',
	"{'single': 'quotes'}",
	'{"version": 1e999}',
	'{"a":"\\ud800"}',
	'{"a":"\\u0000"}',
	'sku,name\nA,\u0000'
);
