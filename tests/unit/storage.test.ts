import { describe, expect, test } from 'vitest';
import {
	PlannerError,
	USABLE_CARD_FRACTION,
	cardsNeeded,
	formatDuration,
	gigabytesRecorded,
	planStorage,
	uploadSecondsFor,
	type StoragePlanInput
} from '../../src/lib/shoot/storage.ts';

// Decimal units throughout: 1 GB = 10^9 bytes, 1 Mbit = 10^6 bit, 1 byte = 8 bit
// (SI prefixes per NIST SP 811 §4; the decimal meaning of G and M for bytes as
// storage and camera makers label them, from memory). So
// GB = Mbit/s × s ÷ 8 ÷ 1000 — see tests/REFERENCES.md, "Recording storage".
// Every expected value below is that arithmetic, worked by hand.

describe('gigabytesRecorded (decimal definition)', () => {
	test('100 Mbit/s for 60 min = 45 GB', () => {
		// 100 × 3600 = 360,000 Mbit; ÷ 8 = 45,000 MB; ÷ 1000 = 45 GB.
		expect(gigabytesRecorded(100, 60 * 60)).toBe(45);
	});

	test('50 Mbit/s for 20 min = 7.5 GB', () => {
		// 50 × 1200 = 60,000 Mbit; ÷ 8 = 7,500 MB; ÷ 1000 = 7.5 GB.
		expect(gigabytesRecorded(50, 20 * 60)).toBe(7.5);
	});
});

describe('uploadSecondsFor (decimal definition)', () => {
	test('45 GB over 100 Mbit/s takes 3600 s, the recording time back again', () => {
		// 45 GB × 8000 Mbit/GB = 360,000 Mbit; ÷ 100 Mbit/s = 3600 s.
		expect(uploadSecondsFor(45, 100)).toBe(3600);
	});

	test('7.5 GB over 20 Mbit/s takes 3000 s', () => {
		// 7.5 × 8000 = 60,000 Mbit; ÷ 20 = 3000 s.
		expect(uploadSecondsFor(7.5, 20)).toBe(3000);
	});
});

describe('cardsNeeded', () => {
	test('the usable allowance is our own 97% of nominal', () => {
		expect(USABLE_CARD_FRACTION).toBe(0.97);
	});

	test('45 GB fits one 64 GB card but needs two 32 GB cards', () => {
		// 64 × 0.97 = 62.08 usable ≥ 45 → 1; 32 × 0.97 = 31.04 usable, 45 ÷ 31.04 ≈ 1.45 → 2.
		expect(cardsNeeded(45, 64 * USABLE_CARD_FRACTION)).toBe(1);
		expect(cardsNeeded(45, 32 * USABLE_CARD_FRACTION)).toBe(2);
	});

	test("footage equal to a card's nominal size needs a second card because of the allowance", () => {
		// 45 GB on "45 GB" cards: usable 43.65 GB < 45 → 2.
		expect(cardsNeeded(45, 45 * USABLE_CARD_FRACTION)).toBe(2);
	});

	test('an exact multiple of the usable size is not rounded up by floating-point error', () => {
		const usable = 64 * USABLE_CARD_FRACTION;
		expect(cardsNeeded(3 * usable, usable)).toBe(3);
		expect(cardsNeeded(3 * usable + 0.01, usable)).toBe(4);
	});
});

describe('planStorage', () => {
	const twoCameraDay: StoragePlanInput = {
		cameras: [
			{ label: 'A-cam', bitrateMbps: 100, count: 2 },
			{ label: 'B-cam', bitrateMbps: 50 }
		],
		programMinutes: 12,
		shootingRatio: 5,
		cardSizeGB: 64,
		uplinkMbps: 40
	};

	test('roll time is programme minutes × shooting ratio, applied once', () => {
		// 12 min × 5 = 60 min = 3600 s per camera.
		const plan = planStorage(twoCameraDay);
		expect(plan.rollSeconds).toBe(3600);
		expect(plan.rollTimeSource).toBe('shooting-ratio');
	});

	test('per-camera gigabytes, cards and upload time for a two-camera day', () => {
		const plan = planStorage(twoCameraDay);
		const [aCam, bCam] = plan.cameras;
		// A-cam: 100 Mbit/s × 3600 s = 45 GB per body; two bodies = 90 GB; 1 card each → 2.
		expect(aCam).toMatchObject({
			label: 'A-cam',
			count: 2,
			gigabytesPerCamera: 45,
			gigabytes: 90,
			cardsPerCamera: 1,
			cards: 2
		});
		// 90 GB × 8000 ÷ 40 Mbit/s = 18,000 s.
		expect(aCam?.uploadSeconds).toBe(18_000);
		// B-cam: 50 Mbit/s × 3600 s = 22.5 GB; count defaults to 1; one card.
		expect(bCam).toMatchObject({
			label: 'B-cam',
			count: 1,
			gigabytesPerCamera: 22.5,
			gigabytes: 22.5,
			cardsPerCamera: 1,
			cards: 1
		});
		// Totals: 90 + 22.5 = 112.5 GB; 3 cards; 112.5 × 8000 ÷ 40 = 22,500 s = 6 h 15 min.
		expect(plan.totalGigabytes).toBe(112.5);
		expect(plan.totalCards).toBe(3);
		expect(plan.uploadSeconds).toBe(22_500);
		expect(formatDuration(plan.uploadSeconds)).toBe('6 h 15 min');
		expect(plan.usableCardGB).toBeCloseTo(62.08, 10);
	});

	test('a roll-hours override replaces the ratio estimate', () => {
		// 0.5 h = 1800 s; 100 Mbit/s × 1800 s = 22.5 GB.
		const plan = planStorage({
			...twoCameraDay,
			cameras: [{ label: 'Bay cam', bitrateMbps: 100 }],
			rollHoursOverride: 0.5
		});
		expect(plan.rollSeconds).toBe(1800);
		expect(plan.rollTimeSource).toBe('override');
		expect(plan.totalGigabytes).toBe(22.5);
	});

	test('a long day on small cards needs several cards per body', () => {
		// 20 min × 10:1 = 200 min = 12,000 s; 150 Mbit/s × 12,000 s = 225 GB;
		// 32 GB cards hold 31.04 usable; 225 ÷ 31.04 ≈ 7.25 → 8 cards.
		const plan = planStorage({
			cameras: [{ label: 'Main', bitrateMbps: 150 }],
			programMinutes: 20,
			shootingRatio: 10,
			cardSizeGB: 32,
			uplinkMbps: 100
		});
		expect(plan.totalGigabytes).toBe(225);
		expect(plan.totalCards).toBe(8);
		// 225 × 8000 ÷ 100 = 18,000 s = 5 h.
		expect(formatDuration(plan.uploadSeconds)).toBe('5 h 00 min');
	});

	test('camera labels are trimmed', () => {
		expect(
			planStorage({ ...twoCameraDay, cameras: [{ label: '  Jib  ', bitrateMbps: 50 }] }).cameras[0]
				?.label
		).toBe('Jib');
	});

	describe('rejects bad input with a PlannerError naming the field', () => {
		const cases: [string, Partial<StoragePlanInput>, string][] = [
			['no cameras', { cameras: [] }, 'cameras'],
			['zero programme minutes', { programMinutes: 0 }, 'programMinutes'],
			['negative programme minutes', { programMinutes: -5 }, 'programMinutes'],
			['shooting ratio below 1:1', { shootingRatio: 0.5 }, 'shootingRatio'],
			['NaN shooting ratio', { shootingRatio: Number.NaN }, 'shootingRatio'],
			['zero card size', { cardSizeGB: 0 }, 'cardSizeGB'],
			['infinite uplink', { uplinkMbps: Number.POSITIVE_INFINITY }, 'uplinkMbps'],
			['zero uplink', { uplinkMbps: 0 }, 'uplinkMbps'],
			['zero override', { rollHoursOverride: 0 }, 'rollHoursOverride'],
			['blank camera label', { cameras: [{ label: '  ', bitrateMbps: 50 }] }, 'cameras.0.label'],
			['zero bitrate', { cameras: [{ label: 'A-cam', bitrateMbps: 0 }] }, 'cameras.0.bitrateMbps'],
			[
				'fractional camera count',
				{ cameras: [{ label: 'A-cam', bitrateMbps: 50, count: 1.5 }] },
				'cameras.0.count'
			],
			[
				'zero camera count',
				{ cameras: [{ label: 'A-cam', bitrateMbps: 50, count: 0 }] },
				'cameras.0.count'
			]
		];

		test.each(cases)('%s', (_name, change, field) => {
			let caught: unknown;
			try {
				planStorage({ ...twoCameraDay, ...change });
			} catch (error) {
				caught = error;
			}
			expect(caught).toBeInstanceOf(PlannerError);
			expect((caught as PlannerError).field).toBe(field);
			expect((caught as PlannerError).name).toBe('PlannerError');
			expect((caught as PlannerError).message.length).toBeGreaterThan(10);
		});
	});
});

describe('formatDuration', () => {
	test('seconds, minutes and hours, rounded up', () => {
		expect(formatDuration(0)).toBe('0 s');
		expect(formatDuration(45)).toBe('45 s');
		expect(formatDuration(44.2)).toBe('45 s');
		expect(formatDuration(60)).toBe('1 min 00 s');
		expect(formatDuration(725)).toBe('12 min 05 s');
		expect(formatDuration(3599.5)).toBe('1 h 00 min');
		expect(formatDuration(3600)).toBe('1 h 00 min');
		// 7,501 s = 125 min 1 s → rounded up to 126 min = 2 h 06 min.
		expect(formatDuration(7501)).toBe('2 h 06 min');
		expect(formatDuration(400_000)).toBe('111 h 07 min');
	});

	test('rejects negative and non-finite durations', () => {
		expect(() => formatDuration(-1)).toThrow(RangeError);
		expect(() => formatDuration(Number.NaN)).toThrow(RangeError);
	});
});
