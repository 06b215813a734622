import { describe, expect, test } from 'vitest';
import { compareTyres, parseTyreSize, SpecError, trueSpeed } from '$lib/specs';

describe('compareTyres: 265/70R17 → 285/70R17, worked by hand', () => {
	// Handbook arithmetic (tests/REFERENCES.md, "Tyres"):
	//   265/70R17: 17 × 25.4 + 2 × 265 × 0.70 = 431.8 + 371 = 802.8 mm
	//   285/70R17: 17 × 25.4 + 2 × 285 × 0.70 = 431.8 + 399 = 830.8 mm
	const change = compareTyres(parseTyreSize('265/70R17'), parseTyreSize('285/70R17'));

	test('diameter grows by 28 mm = 1.102 in', () => {
		// 830.8 − 802.8 = 28 mm; 28 ÷ 25.4 = 1.1024 in.
		expect(change.diameterChangeMm).toBeCloseTo(28, 9);
		expect(change.diameterChangeIn).toBeCloseTo(1.1024, 4);
		// 28 ÷ 802.8 × 100 = 3.488 %.
		expect(change.diameterChangePercent).toBeCloseTo(3.488, 3);
	});

	test('ground clearance under the axle rises by half the diameter change: 14 mm = 0.551 in', () => {
		// Common practice (tests/REFERENCES.md, "Tyres"): axle height rises by half the diameter
		// increase. 28 ÷ 2 = 14 mm; 14 ÷ 25.4 = 0.5512 in.
		expect(change.groundClearanceChangeMm).toBeCloseTo(14, 9);
		expect(change.groundClearanceChangeIn).toBeCloseTo(0.5512, 4);
	});

	test('speedometer: true speed = indicated × 830.8 ÷ 802.8', () => {
		// tests/REFERENCES.md, "Tyres": true = indicated × new ÷ old. 830.8 ÷ 802.8 = 1.034878.
		// 60 mph × 1.034878 = 62.093 mph; 100 km/h × 1.034878 = 103.488 km/h.
		expect(change.speedometerFactor).toBeCloseTo(1.034878, 6);
		expect(change.trueSpeedAt(60)).toBeCloseTo(62.093, 3);
		expect(change.trueSpeedAt(100)).toBeCloseTo(103.488, 3);
		// Reads low: at a true 103.488 km/h it shows 100, i.e. (1 ÷ 1.034878 − 1) = −3.370 % of true speed.
		expect(change.speedometerErrorPercent).toBeCloseTo(-3.37, 2);
	});

	test('revolutions per mile fall from 638.10 to 616.60', () => {
		// 63,360 ÷ (π × 802.8 ÷ 25.4) = 63,360 ÷ 99.294 = 638.10; 63,360 ÷ (π × 830.8 ÷ 25.4) = 63,360 ÷ 102.757 = 616.60.
		// Change: 616.60 − 638.10 = −21.51 per mile.
		expect(change.revsPerMileChange).toBeCloseTo(-21.51, 2);
		// Per km: 10⁶ ÷ (π × 830.8) − 10⁶ ÷ (π × 802.8) = 383.137 − 396.500 = −13.363.
		expect(change.revsPerKmChange).toBeCloseTo(-13.363, 3);
	});

	test('width grows by 20 mm = 0.787 in', () => {
		// 285 − 265 = 20 mm; 20 ÷ 25.4 = 0.7874 in.
		expect(change.widthChangeMm).toBe(20);
		expect(change.widthChangeIn).toBeCloseTo(0.7874, 4);
	});

	test('a taller tyre brings the "reads low" and clearance cautions', () => {
		expect(change.cautions.some((caution) => /read low/.test(caution))).toBe(true);
		expect(change.cautions.some((caution) => /full steering lock/.test(caution))).toBe(true);
	});
});

describe('compareTyres: a tyre 5 in taller', () => {
	// Common practice (tests/REFERENCES.md, "Tyres"): a tyre 5 in taller raises the axle about 2.5 in.
	const change = compareTyres(parseTyreSize('30x9.50R15'), parseTyreSize('35x12.50R15'));

	test('raises the axle 2.5 in (63.5 mm)', () => {
		// 35 − 30 = 5 in; 5 ÷ 2 = 2.5 in; 2.5 × 25.4 = 63.5 mm.
		expect(change.diameterChangeIn).toBe(5);
		expect(change.groundClearanceChangeIn).toBe(2.5);
		expect(change.groundClearanceChangeMm).toBeCloseTo(63.5, 9);
	});

	test('an indicated 60 mph is a true 70 mph', () => {
		// 60 × 35 ÷ 30 = 70 mph; 100 × 35 ÷ 30 = 116.667 km/h.
		expect(change.trueSpeedAt(60)).toBeCloseTo(70, 9);
		expect(change.trueSpeedAt(100)).toBeCloseTo(116.667, 3);
	});

	test('revolutions per mile drop by 96.04', () => {
		// 63,360 ÷ (π × 30) = 672.270; 63,360 ÷ (π × 35) = 576.232; difference −96.039.
		expect(change.revsPerMileChange).toBeCloseTo(-96.039, 3);
	});
});

describe('compareTyres: smaller and equal sizes', () => {
	test('a shorter tyre lowers the axle and the speedometer reads high', () => {
		const change = compareTyres(parseTyreSize('285/70R17'), parseTyreSize('265/70R17'));
		// Reverse of the worked example: −28 mm, −14 mm, 60 × 802.8 ÷ 830.8 = 57.978 mph.
		expect(change.diameterChangeMm).toBeCloseTo(-28, 9);
		expect(change.groundClearanceChangeMm).toBeCloseTo(-14, 9);
		expect(change.trueSpeedAt(60)).toBeCloseTo(57.978, 3);
		expect(change.cautions.some((caution) => /read high/.test(caution))).toBe(true);
	});

	test('the same size changes nothing', () => {
		const change = compareTyres(parseTyreSize('285/70R17'), parseTyreSize('lt285/70 r17'));
		expect(change.speedometerFactor).toBe(1);
		expect(change.trueSpeedAt(60)).toBe(60);
		expect(change.groundClearanceChangeIn).toBe(0);
		expect(change.cautions.some((caution) => /read (low|high)/.test(caution))).toBe(false);
	});

	test('a negative or non-numeric indicated speed is refused with a SpecError', () => {
		expect(() => trueSpeed(-5, 1.02)).toThrow(SpecError);
		expect(() => trueSpeed(Number.NaN, 1.02)).toThrow(SpecError);
	});
});
