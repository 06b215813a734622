/**
 * The CSV writer ($lib/csv) against its outside sources:
 * - RFC 4180 §2: records end in CRLF (rule 1); fields with commas, quotes, CR or LF are enclosed in
 *   double quotes (rule 6) and a quote inside is doubled (rule 7, whose example is "b""bb").
 * - OWASP, "CSV Injection": cells starting with =, +, -, @, tab or carriage return are run as
 *   formulas by spreadsheets; prefixing a single quote makes them text.
 * - papaparse (the npm reference parser) reads every file back.
 */
import Papa from 'papaparse';
import { describe, expect, test } from 'vitest';
import { csvText, unguardCell } from '$lib/csv';

describe('RFC 4180 framing', () => {
	test('every record ends in CRLF, including the last', () => {
		expect(
			csvText([
				['a', 'b'],
				['1', '2']
			])
		).toBe('a,b\r\n1,2\r\n');
	});

	test('a quote inside a field is doubled and the field quoted (RFC 4180 §2 rule 7)', () => {
		expect(csvText([['aaa', 'b"bb', 'ccc']])).toBe('aaa,"b""bb",ccc\r\n');
	});

	test('commas and line breaks are enclosed in quotes (rule 6) and read back whole', () => {
		const records = [
			['title', 'note'],
			['Lift, then level', 'line one\r\nline two'],
			['Caution', 'Stands, not jacks\nalways']
		];
		const text = csvText(records);
		expect(text).toContain('"Lift, then level","line one\r\nline two"');
		const parsed = Papa.parse<string[]>(text, { skipEmptyLines: true });
		expect(parsed.errors).toEqual([]);
		expect(parsed.data).toEqual(records);
	});

	test('no records is an empty file', () => {
		expect(csvText([])).toBe('');
	});
});

describe('spreadsheet formula guard (OWASP CSV Injection)', () => {
	const triggers = ['=1+1', '+2 in lift', '-0.5 in', '@SUM(A1)', '\tindented', '\rreturn'];

	test('each trigger character gets a leading apostrophe when asked, and only then', () => {
		const guarded = Papa.parse<string[]>(csvText([triggers], { escapeFormulae: true })).data[0];
		expect(guarded).toEqual(triggers.map((cell) => `'${cell}`));
		const plain = Papa.parse<string[]>(csvText([triggers])).data[0];
		expect(plain).toEqual(triggers);
	});

	test('ordinary cells are left as they are', () => {
		const cells = ['KBS-LB-300T', '119.00', "Driver's side", 'https://shop.example.test/p/x', ''];
		expect(Papa.parse<string[]>(csvText([cells], { escapeFormulae: true })).data[0]).toEqual(cells);
	});

	test('unguardCell takes the guard off, so a guarded export reads back exactly', () => {
		const cells = [...triggers, "'quoted on purpose", 'plain'];
		const read = Papa.parse<string[]>(csvText([cells], { escapeFormulae: true })).data[0].map(
			unguardCell
		);
		expect(read).toEqual(cells);
		// An apostrophe not followed by a trigger character is the person's own and stays.
		expect(unguardCell("'quoted on purpose")).toBe("'quoted on purpose");
		expect(unguardCell("'=1+1")).toBe('=1+1');
	});
});
