/**
 * Tyre size forms moulded on sidewalls beyond plain W/AR Rd: the commercial "C" suffix, run-flat
 * "RF", a service description in parentheses, bias sizes like 7.50-16, and flotation sizes whose
 * first number is a nominal diameter. Geometry by handbook arithmetic (tests/REFERENCES.md "Tyres").
 */
import { describe, expect, test } from 'vitest';
import { renderSpecCard, parseTyreSize, SpecError } from '$lib/specs';

describe('tyre size forms', () => {
	test('215/65R16C is a commercial (light-truck load) size with metric geometry', () => {
		// Handbook arithmetic: sidewall 215 × 0.65 = 139.75 mm; 16 × 25.4 + 2 × 139.75 = 685.9 mm = 27.00 in.
		const size = parseTyreSize('215/65R16C');
		expect(size.code).toBe('215/65R16C');
		expect(size.commercial).toBe(true);
		expect(size.diameterMm).toBeCloseTo(685.9, 6);
		expect(size.diameterIn).toBeCloseTo(27.0, 2);
		expect(parseTyreSize('215/65 R16C 109/107R')).toMatchObject({
			code: '215/65R16C 109/107R',
			loadIndex: 109,
			dualLoadIndex: 107
		});
	});

	test('245/45RF18 is a run-flat radial', () => {
		// Handbook arithmetic: 245 × 0.45 = 110.25 mm; 18 × 25.4 + 220.5 = 677.7 mm.
		const size = parseTyreSize('245/45RF18');
		expect(size).toMatchObject({ code: '245/45RF18', construction: 'R', runFlat: true });
		expect(size.diameterMm).toBeCloseTo(677.7, 6);
	});

	test('a service description in parentheses, (102Y), is read', () => {
		const size = parseTyreSize('275/35ZR20 (102Y)');
		expect(size).toMatchObject({ code: '275/35ZR20 (102Y)', loadIndex: 102, speedRating: 'Y' });
	});

	test('a bias size 7.50-16 is read as 7.50 in wide on a 16 in rim, diameter from the maker', () => {
		// 7.50 in × 25.4 = 190.5 mm. The overall diameter is not in a bias code: the maker's chart gives it.
		const failure = (() => {
			try {
				parseTyreSize('7.50-16');
			} catch (error) {
				return error as SpecError;
			}
		})();
		expect(failure).toBeInstanceOf(SpecError);
		expect(failure?.message).toMatch(/bias/);
		expect(failure?.message).toMatch(/7\.50 in \(190\.5 mm\) wide on a 16 in rim/);
		expect(failure?.message).toMatch(/diameter from the maker’s chart needed/);
	});

	test('a flotation size’s diameter is nominal, and its card says so', () => {
		// 35x12.50R17: the 35 in is the nominal overall diameter named by the size (common practice).
		const size = parseTyreSize('35x12.50R17');
		expect(size.diameterNominal).toBe(true);
		expect(parseTyreSize('285/70R17').diameterNominal).toBe(false);
		const card = renderSpecCard({ kind: 'tyre', size: '35x12.50R17' });
		expect(card.lines[0].label).toBe('Overall diameter (nominal, from the size)');
		const metricCard = renderSpecCard({ kind: 'tyre', size: '285/70R17' });
		expect(metricCard.lines[0].label).toBe('Overall diameter');
		const change = renderSpecCard({ kind: 'tyre-change', from: '285/70R17', to: '35x12.50R17' });
		expect(change.lines[0].label).toBe('Overall diameter (35x12.50R17 nominal)');
	});
});
