import fc from 'fast-check';
import { describe, expect, test } from 'vitest';
import { parseTyreSize, SpecError, TYRE_LIMITS } from '$lib/specs';

/** Runs `action` and returns the SpecError it throws; fails the test on success or on any other error. */
function specErrorFrom(action: () => unknown): SpecError {
	try {
		action();
	} catch (error) {
		expect(error).toBeInstanceOf(SpecError);
		return error as SpecError;
	}
	throw new Error('expected a SpecError, but nothing was thrown');
}

describe('parseTyreSize: metric diameters against handbook arithmetic', () => {
	test('355/60R20 is about 36.8 in tall', () => {
		// Common practice (handbook arithmetic): 20 + 2 × 355 × 0.60 ÷ 25.4 = 20 + 426 ÷ 25.4 = 36.77 in.
		const size = parseTyreSize('355/60R20');
		expect(size.diameterIn).toBeCloseTo(36.77, 2);
		// 20 × 25.4 + 2 × 213 = 508 + 426 = 934 mm.
		expect(size.diameterMm).toBeCloseTo(934, 6);
		expect(size.sidewallMm).toBe(213);
	});

	test('285/70R17 is 32.71 in (handbook worked example)', () => {
		// tests/REFERENCES.md, "Tyres": 17 + 2 × 199.5 ÷ 25.4 = 17 + 15.709 = 32.71 in.
		expect(parseTyreSize('285/70R17').diameterIn).toBeCloseTo(32.71, 2);
	});

	test('265/70R17 is 31.61 in (handbook worked example)', () => {
		// tests/REFERENCES.md, "Tyres": 17 + 2 × 185.5 ÷ 25.4 = 17 + 14.606 = 31.61 in.
		expect(parseTyreSize('265/70R17').diameterIn).toBeCloseTo(31.61, 2);
	});

	test('225/70R15 is 27.40 in and 696 mm (handbook worked example)', () => {
		// tests/REFERENCES.md, "Tyres": 15 × 25.4 + 2 × 157.5 = 381 + 315 = 696 mm; 696 ÷ 25.4 = 27.40 in
		// (matches a drivetrain maker's published calculator example).
		const size = parseTyreSize('225/70R15');
		expect(size.diameterIn).toBeCloseTo(27.4, 2);
		expect(size.diameterMm).toBeCloseTo(696, 6);
	});

	test('315/70R17 is about 34.4 in tall and 12.4 in wide (published size conversion)', () => {
		// engineerfix.com, "What is a 315/70R17 tire size in inches": about 34.4 in overall, about 12.4 in wide.
		const size = parseTyreSize('315/70R17');
		expect(size.diameterIn).toBeCloseTo(34.4, 1);
		expect(size.sectionWidthIn).toBeCloseTo(12.4, 1);
	});

	test('P265/75R16 is about 31.6 in tall (tyre size chart, from memory)', () => {
		// Common tyre size conversion charts list P265/75R16 as 31.6 in × 10.4 in (from memory).
		const size = parseTyreSize('P265/75R16');
		expect(size.diameterIn).toBeCloseTo(31.6, 1);
		expect(size.sectionWidthIn).toBeCloseTo(10.4, 1);
		expect(size.serviceType).toBe('P');
	});

	test('circumference and revolutions per mile and per km follow from the diameter', () => {
		// Handbook: circumference = π × diameter; revs/mile = 63,360 ÷ circumference (in); revs/km = 10⁶ ÷ circumference (mm).
		// 285/70R17: 830.8 mm → π × 830.8 = 2610.035 mm; 10⁶ ÷ 2610.035 = 383.14 per km.
		// 32.7087 in → π × 32.7087 = 102.757 in; 63,360 ÷ 102.757 = 616.60 per mile.
		const size = parseTyreSize('285/70R17');
		expect(size.circumferenceMm).toBeCloseTo(2610.035, 2);
		expect(size.circumferenceIn).toBeCloseTo(102.757, 2);
		expect(size.revsPerMile).toBeCloseTo(616.6, 1);
		expect(size.revsPerKm).toBeCloseTo(383.14, 2);
	});
});

describe('parseTyreSize: the forms crews type', () => {
	test('reads an LT size with its service description', () => {
		const size = parseTyreSize('LT285/70R17 121/118S');
		expect(size).toMatchObject({
			kind: 'metric',
			code: 'LT285/70R17 121/118S',
			serviceType: 'LT',
			construction: 'R',
			sectionWidthMm: 285,
			aspectRatio: 70,
			rimIn: 17,
			loadIndex: 121,
			dualLoadIndex: 118,
			speedRating: 'S'
		});
	});

	test('lower case, a space before the R and ZR all normalise to one code', () => {
		expect(parseTyreSize('265/70 R17').code).toBe('265/70R17');
		expect(parseTyreSize('  lt285/70r17  ').code).toBe('LT285/70R17');
		expect(parseTyreSize('255/35zr19 96y')).toMatchObject({
			code: '255/35ZR19 96Y',
			construction: 'ZR',
			loadIndex: 96
		});
	});

	test('construction letter is optional (then a space separates aspect ratio and rim)', () => {
		const size = parseTyreSize('285/70 17');
		expect(size.construction).toBeNull();
		expect(size.code).toBe('285/70 17');
		expect(size.diameterIn).toBeCloseTo(parseTyreSize('285/70R17').diameterIn, 12);
	});

	test('bias (D) and belted (B) construction letters are read', () => {
		expect(parseTyreSize('235/85D16').construction).toBe('D');
		expect(parseTyreSize('235/85B16').construction).toBe('B');
	});

	test('flotation sizes: diameter equals the first number, width the second, sidewall is half the rest', () => {
		// Flotation code (common practice): overall diameter × section width, rim; all inches.
		const size = parseTyreSize('35x12.50R17');
		expect(size.kind).toBe('flotation');
		expect(size.diameterIn).toBe(35);
		expect(size.sectionWidthIn).toBe(12.5);
		// (35 − 17) ÷ 2 = 9 in; 9 × 25.4 = 228.6 mm.
		expect(size.sidewallIn).toBe(9);
		expect(size.sidewallMm).toBeCloseTo(228.6, 9);
		// Aspect ratio worked out: 9 ÷ 12.5 = 72 %.
		expect(size.aspectRatio).toBeCloseTo(72, 9);
		expect(size.diameterMm).toBeCloseTo(35 * 25.4, 9);
	});

	test('flotation codes normalise: lower-case x, two-decimal width and an LT suffix', () => {
		expect(parseTyreSize('33X12.5R15')).toMatchObject({
			code: '33x12.50R15',
			diameterIn: 33,
			sectionWidthIn: 12.5,
			rimIn: 15
		});
		expect(parseTyreSize('37x13.50R20LT')).toMatchObject({
			code: '37x13.50R20LT',
			diameterIn: 37,
			serviceType: 'LT'
		});
	});
});

describe('parseTyreSize: clear SpecError messages', () => {
	test.each([
		['285/70', /no rim size/],
		['R17', /no width/],
		['285/120R17', /over 100/],
		['285/15R17', /under 20/],
		['50/70R17', /outside 100–500 mm/],
		['650/70R17', /outside 100–500 mm/],
		['285/70R8', /outside 10–30 in/],
		['285/70R32', /outside 10–30 in/],
		['30x9.50R30', /not larger than the 30 in rim/],
		['', /empty/],
		['   ', /empty/],
		['banana', /not a tyre size/],
		['285/70/17', /not after a second slash/],
		['P285/70R17LT', /both P .* and LT/],
		['285/70R17 118/121S', /should be lower/],
		['285/70R17 XL', /not a service description/]
	])('%s → SpecError matching %s', (text, message) => {
		expect(specErrorFrom(() => parseTyreSize(text)).message).toMatch(message);
	});

	test('a value that is not text is refused with a SpecError', () => {
		expect(specErrorFrom(() => parseTyreSize(undefined as unknown as string)).message).toMatch(
			/as text/
		);
	});
});

describe('parseTyreSize: properties (fast-check)', () => {
	/** Either a size with sane geometry or a SpecError; anything else is a bug. */
	function parsesOrRefusesCleanly(text: string): void {
		try {
			const size = parseTyreSize(text);
			expect(Number.isFinite(size.diameterIn)).toBe(true);
			expect(size.diameterIn).toBeGreaterThan(size.rimIn);
		} catch (error) {
			if (!(error instanceof SpecError)) throw error;
			expect(error.message.length).toBeGreaterThan(0);
		}
	}

	test('random text never throws anything but SpecError', () => {
		fc.assert(fc.property(fc.string({ maxLength: 60 }), parsesOrRefusesCleanly), { numRuns: 1500 });
		fc.assert(fc.property(fc.string({ unit: 'binary', maxLength: 60 }), parsesOrRefusesCleanly), {
			numRuns: 1000
		});
	});

	test('near-miss codes built from digits, slashes, R and x never throw anything but SpecError', () => {
		const piece = fc.constantFrom(
			...'0123456789',
			'/',
			'R',
			'r',
			'x',
			'X',
			'.',
			' ',
			'LT',
			'P',
			'ZR',
			'D',
			'S',
			'12',
			'70',
			'285'
		);
		const nearMiss = fc.array(piece, { maxLength: 16 }).map((pieces) => pieces.join(''));
		fc.assert(fc.property(nearMiss, parsesOrRefusesCleanly), { numRuns: 3000 });
	});

	const metricSizes = fc.record({
		prefix: fc.constantFrom('', 'P', 'LT', 'p', 'lt'),
		width: fc.integer({ min: TYRE_LIMITS.sectionWidthMm.min, max: TYRE_LIMITS.sectionWidthMm.max }),
		aspect: fc.integer({ min: TYRE_LIMITS.aspectRatio.min, max: TYRE_LIMITS.aspectRatio.max }),
		construction: fc.constantFrom('R', 'r', 'ZR', 'D', 'B', ' R', 'R ', ' '),
		rimHalves: fc.integer({ min: TYRE_LIMITS.rimIn.min * 2, max: TYRE_LIMITS.rimIn.max * 2 }),
		service: fc.option(
			fc.record({
				load: fc.integer({ min: 60, max: 150 }),
				dualDrop: fc.option(fc.integer({ min: 1, max: 10 })),
				speed: fc.constantFrom('S', 'T', 'Q', 'h', 'V')
			})
		)
	});

	test('parsed metric codes round-trip through the normalised code', () => {
		fc.assert(
			fc.property(metricSizes, (parts) => {
				const rim = parts.rimHalves / 2;
				const service = parts.service
					? ` ${parts.service.load}${parts.service.dualDrop === null ? '' : `/${parts.service.load - parts.service.dualDrop}`}${parts.service.speed}`
					: '';
				const typed = `${parts.prefix}${parts.width}/${parts.aspect}${parts.construction}${rim}${service}`;
				const first = parseTyreSize(typed);
				const again = parseTyreSize(first.code);
				expect(again).toEqual(first);
				expect(first).toMatchObject({
					kind: 'metric',
					sectionWidthMm: parts.width,
					aspectRatio: parts.aspect,
					rimIn: rim
				});
				// Handbook formula, worked independently of the module: rim + 2 × W × AR ÷ 100 ÷ 25.4.
				expect(first.diameterIn).toBeCloseTo(
					rim + (2 * parts.width * parts.aspect) / 100 / 25.4,
					9
				);
			}),
			{ numRuns: 1500 }
		);
	});

	test('parsed flotation codes round-trip through the normalised code', () => {
		const flotationSizes = fc
			.record({
				rim: fc.integer({ min: 14, max: 24 }),
				width: fc.constantFrom(9.5, 10.5, 11.5, 12.5, 13.5, 14.5),
				extraDiameter: fc.integer({ min: 8, max: 16 }),
				lt: fc.boolean()
			})
			.map((parts) => ({ ...parts, diameter: parts.rim + parts.extraDiameter }));
		fc.assert(
			fc.property(flotationSizes, (parts) => {
				const typed = `${parts.diameter}x${parts.width}R${parts.rim}${parts.lt ? 'LT' : ''}`;
				const first = parseTyreSize(typed);
				expect(parseTyreSize(first.code)).toEqual(first);
				expect(first.diameterIn).toBe(parts.diameter);
			}),
			{ numRuns: 500 }
		);
	});
});
