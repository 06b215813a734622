import { createRequire } from 'node:module';
import fc from 'fast-check';
import { describe, expect, test } from 'vitest';
import {
	convertTorque,
	formatQuantity,
	ftLbfToNm,
	inLbfToNm,
	inToMm,
	lbfToN,
	MILLIMETRES_PER_INCH,
	mmToIn,
	NEWTON_METRES_PER_FOOT_POUND_FORCE,
	NEWTON_METRES_PER_INCH_POUND_FORCE,
	NEWTONS_PER_POUND_FORCE,
	nmToFtLbf,
	nmToInLbf,
	nToLbf,
	SpecError,
	torqueCard
} from '$lib/specs';

// convert-units (npm, MIT) ships no types and no torque or force measures: it has length and mass only,
// so the cross-check below rebuilds ft·lbf from its foot and pound with standard gravity.
type ConvertUnits = (value: number) => { from(unit: string): { to(unit: string): number } };
const convert = createRequire(import.meta.url)('convert-units') as ConvertUnits;

// Exact definitions behind NIST SP 811 Appendix B.8: 1 lb = 0.45359237 kg, g_n = 9.80665 m/s², 1 ft = 0.3048 m.
const POUND_KG = 0.45359237;
const STANDARD_GRAVITY = 9.80665;
const FOOT_M = 0.3048;
const INCH_M = 0.0254;

describe('NIST SP 811 Appendix B.8 factors', () => {
	test('the named constants are the published figures', () => {
		// NIST SP 811 (2008) Appendix B.8: ft·lbf → N·m 1.355818; in·lbf → N·m 0.1129848; lbf → N 4.448222; in → mm 25.4 (exact).
		expect(NEWTON_METRES_PER_FOOT_POUND_FORCE).toBe(1.355818);
		expect(NEWTON_METRES_PER_INCH_POUND_FORCE).toBe(0.1129848);
		expect(NEWTONS_PER_POUND_FORCE).toBe(4.448222);
		expect(MILLIMETRES_PER_INCH).toBe(25.4);
	});

	test('1 ft·lbf = 0.45359237 kg × 9.80665 m/s² × 0.3048 m = 1.3558179483… N·m, to the seven digits NIST prints', () => {
		const exact = POUND_KG * STANDARD_GRAVITY * FOOT_M;
		expect(exact).toBeCloseTo(1.3558179483, 10);
		expect(ftLbfToNm(1)).toBe(1.355818);
		// B.8 rounds to 7 significant digits, so the factor is within half a unit in the 7th digit of the exact value.
		expect(Math.abs(ftLbfToNm(1) - exact)).toBeLessThan(0.5e-6);
	});

	test('1 in·lbf and 1 lbf agree with the exact derivation to seven digits', () => {
		// 0.45359237 × 9.80665 × 0.0254 = 0.112984829… N·m; 0.45359237 × 9.80665 = 4.4482216… N.
		expect(Math.abs(inLbfToNm(1) - POUND_KG * STANDARD_GRAVITY * INCH_M)).toBeLessThan(0.5e-7);
		expect(Math.abs(lbfToN(1) - POUND_KG * STANDARD_GRAVITY)).toBeLessThan(0.5e-6);
	});

	test('conversions against hand-worked figures', () => {
		// 95 × 1.355818 = 128.80271 N·m; 100 ÷ 1.355818 = 73.7562 ft·lbf; 80 × 0.1129848 = 9.038784 N·m.
		expect(ftLbfToNm(95)).toBeCloseTo(128.80271, 9);
		expect(nmToFtLbf(100)).toBeCloseTo(73.7562, 4);
		expect(inLbfToNm(80)).toBeCloseTo(9.038784, 9);
		expect(nmToInLbf(9.038784)).toBeCloseTo(80, 9);
		// 2.5 in × 25.4 = 63.5 mm; 935 mm ÷ 25.4 = 36.811 in; 100 lbf × 4.448222 = 444.8222 N.
		expect(inToMm(2.5)).toBeCloseTo(63.5, 12);
		expect(mmToIn(935)).toBeCloseTo(36.811, 3);
		expect(lbfToN(100)).toBeCloseTo(444.8222, 9);
		expect(nToLbf(444.8222)).toBeCloseTo(100, 9);
	});

	test('ft·lbf ↔ in·lbf uses the exact 12 in per ft', () => {
		expect(convertTorque(10, 'ft·lbf', 'in·lbf')).toBe(120);
		expect(convertTorque(120, 'in·lbf', 'ft·lbf')).toBe(10);
		// Through N·m the two rounded B.8 factors still agree to 1 part in 10⁶: 1.355818 ÷ 0.1129848 = 11.99999…
		expect(convertTorque(10, 'ft·lbf', 'N·m') / NEWTON_METRES_PER_INCH_POUND_FORCE).toBeCloseTo(
			120,
			3
		);
	});
});

describe('cross-check with convert-units (npm)', () => {
	test('inches to millimetres agree (convert-units uses 1 m = 3.28084 ft, so to about 1 part in 10⁷)', () => {
		for (const inches of [1, 2.5, 17, 35]) {
			const theirs = convert(inches).from('in').to('mm');
			expect(Math.abs(inToMm(inches) - theirs) / theirs).toBeLessThan(1e-7);
		}
	});

	test('ft·lbf rebuilt from convert-units pound and foot × 9.80665 agrees to about 1 part in 10⁶', () => {
		// convert-units has no torque; its pound is 453.592 g (not 453.59237), hence the 1e-6 tolerance.
		const footPoundForceNm =
			convert(1).from('lb').to('kg') * STANDARD_GRAVITY * convert(1).from('ft').to('m');
		const inchPoundForceNm =
			convert(1).from('lb').to('kg') * STANDARD_GRAVITY * convert(1).from('in').to('m');
		expect(Math.abs(ftLbfToNm(1) - footPoundForceNm) / footPoundForceNm).toBeLessThan(1e-6);
		expect(Math.abs(inLbfToNm(1) - inchPoundForceNm) / inchPoundForceNm).toBeLessThan(1e-6);
		expect(
			Math.abs(lbfToN(1) - convert(1).from('lb').to('kg') * STANDARD_GRAVITY) / lbfToN(1)
		).toBeLessThan(1e-6);
	});
});

describe('round trips and single rounding', () => {
	const statedTorque = fc.integer({ min: 1, max: 100_000 }).map((hundredths) => hundredths / 100);

	test('ft·lbf → N·m → ft·lbf returns the stated value at any display precision', () => {
		fc.assert(
			fc.property(statedTorque, (footPounds) => {
				const back = nmToFtLbf(ftLbfToNm(footPounds));
				expect(formatQuantity(back, 'ft·lbf', 2)).toBe(formatQuantity(footPounds, 'ft·lbf', 2));
				expect(Math.abs(back - footPounds)).toBeLessThan(1e-9);
			}),
			{ numRuns: 2000 }
		);
	});

	test('converting back a displayed whole N·m stays within half a display step', () => {
		// Reading the rounded on-screen N·m and converting it back is off by at most 0.5 N·m ÷ 1.355818 = 0.369 ft·lbf.
		fc.assert(
			fc.property(statedTorque, (footPounds) => {
				const shownNm = Number(
					torqueCard({ value: footPounds, unit: 'ft·lbf' }).metric.split(' ')[0]
				);
				expect(Math.abs(nmToFtLbf(shownNm) - footPounds)).toBeLessThanOrEqual(
					0.5 / 1.355818 + 1e-9
				);
			}),
			{ numRuns: 2000 }
		);
	});

	test('the torque card converts from the stated value, never from a rounded one', () => {
		// 94.75 ft·lbf × 1.355818 = 128.4638 N·m → "128 N·m". Rounding twice (first to 128.5, then whole) would show 129.
		const card = torqueCard({ value: 94.75, unit: 'ft·lbf' });
		expect(card.newtonMetres).toBe(94.75 * 1.355818);
		expect(card.metric).toBe('128 N·m');
		expect(card.imperial).toBe('94.75 ft·lbf');
	});

	test('formatQuantity rounds once: 2.449 shows as 2.4, not 2.5', () => {
		// Rounding to 2.45 first and then to one decimal would give 2.5.
		expect(formatQuantity(2.449, 'in', 1)).toBe('2.4 in');
		expect(formatQuantity(36.77165, 'in', 1)).toBe('36.8 in');
		expect(formatQuantity(-0.04, 'in', 1)).toBe('0.0 in');
		expect(formatQuantity(1.1, 'in', 1, { signed: true })).toBe('+1.1 in');
		expect(formatQuantity(-1.1, 'in', 1, { signed: true })).toBe('-1.1 in');
		expect(() => formatQuantity(Number.NaN, 'in', 1)).toThrow(SpecError);
		expect(() => formatQuantity(1, 'in', 1.5)).toThrow(SpecError);
	});
});

describe('torqueCard', () => {
	test('95 ft·lbf reads 95 ft·lbf / 129 N·m', () => {
		// 95 × 1.355818 = 128.80 → 129.
		expect(torqueCard({ value: 95, unit: 'ft·lbf' })).toMatchObject({
			imperial: '95 ft·lbf',
			metric: '129 N·m'
		});
	});

	test('140 N·m reads 103 ft·lbf / 140 N·m', () => {
		// 140 ÷ 1.355818 = 103.26 → 103.
		expect(torqueCard({ value: 140, unit: 'N·m' })).toMatchObject({
			imperial: '103 ft·lbf',
			metric: '140 N·m'
		});
	});

	test('small fasteners keep their meaning: in·lbf input, small N·m shown in in·lbf', () => {
		// 80 × 0.1129848 = 9.0388 N·m → "9.04 N·m"; 9 ÷ 0.1129848 = 79.657 in·lbf → "79.7 in·lbf".
		expect(torqueCard({ value: 80, unit: 'in·lbf' })).toMatchObject({
			imperial: '80 in·lbf',
			metric: '9.04 N·m'
		});
		expect(torqueCard({ value: 9, unit: 'N·m' })).toMatchObject({
			imperial: '79.7 in·lbf',
			metric: '9 N·m'
		});
	});

	test('zero, negative, non-numeric or absurd torque is refused with a SpecError', () => {
		expect(() => torqueCard({ value: 0, unit: 'ft·lbf' })).toThrow(SpecError);
		expect(() => torqueCard({ value: -10, unit: 'N·m' })).toThrow(SpecError);
		expect(() => torqueCard({ value: Number.NaN, unit: 'N·m' })).toThrow(SpecError);
		expect(() => torqueCard({ value: 1e9, unit: 'ft·lbf' })).toThrow(SpecError);
		expect(() => torqueCard({ value: 10, unit: 'kg·m' as 'N·m' })).toThrow(SpecError);
	});
});

describe('torque precision: three significant figures, the same rule both directions', () => {
	// NIST SP 811 Appendix B.8: 1 ft·lbf = 1.355818 N·m; 1 in·lbf = 0.1129848 N·m.
	test('2 ft·lbf reads 2.71 N·m and 0.5 ft·lbf reads 0.678 N·m', () => {
		// 2 × 1.355818 = 2.711636 → 2.71; 0.5 × 1.355818 = 0.677909 → 0.678.
		expect(torqueCard({ value: 2, unit: 'ft·lbf' }).metric).toBe('2.71 N·m');
		expect(torqueCard({ value: 0.5, unit: 'ft·lbf' }).metric).toBe('0.678 N·m');
		// 20 × 1.355818 = 27.11636 → 27.1; 95 → 128.80 → 129 (whole units are never rounded away).
		expect(torqueCard({ value: 20, unit: 'ft·lbf' }).metric).toBe('27.1 N·m');
		expect(torqueCard({ value: 95, unit: 'ft·lbf' }).metric).toBe('129 N·m');
	});

	test('N·m to ft·lbf and in·lbf rounds by the same rule', () => {
		// 2.71 ÷ 0.1129848 = 23.985 → 24.0 in·lbf; 140 ÷ 1.355818 = 103.26 → 103 ft·lbf.
		expect(torqueCard({ value: 2.71, unit: 'N·m' }).imperial).toBe('24.0 in·lbf');
		expect(torqueCard({ value: 140, unit: 'N·m' }).imperial).toBe('103 ft·lbf');
		// 20 N·m ÷ 1.355818 = 14.751 → 14.8 ft·lbf.
		expect(torqueCard({ value: 20, unit: 'N·m' }).imperial).toBe('14.8 ft·lbf');
	});

	test('the shown converted figure never errs more than 1 % from the exact one, either way', () => {
		const statedTorque = fc.integer({ min: 1, max: 1_000_000 }).map((x) => x / 1000);
		fc.assert(
			fc.property(statedTorque, fc.constantFrom('ft·lbf', 'N·m', 'in·lbf'), (value, unit) => {
				const card = torqueCard({ value, unit: unit as 'ft·lbf' | 'N·m' | 'in·lbf' });
				const converted = unit === 'N·m' ? card.imperial : card.metric;
				const [number, shownUnit] = converted.split(' ');
				const exact =
					shownUnit === 'N·m'
						? card.newtonMetres
						: shownUnit === 'ft·lbf'
							? card.footPoundsForce
							: card.inchPoundsForce;
				expect(Math.abs(Number(number) - exact) / exact).toBeLessThanOrEqual(0.01);
			}),
			{ numRuns: 3000 }
		);
	});

	test('convert-units agrees on 2 ft·lbf to three significant figures', () => {
		// Rebuilt from convert-units' foot and pound with standard gravity (it has no torque measure).
		const nm = convert(2).from('ft').to('m') * convert(1).from('lb').to('kg') * STANDARD_GRAVITY;
		expect(torqueCard({ value: 2, unit: 'ft·lbf' }).metric).toBe(`${nm.toPrecision(3)} N·m`);
	});
});
