/**
 * The shoot-day storage plan, checked against hand-worked arithmetic with the decimal definition
 * GB = Mbit/s × seconds ÷ 8 ÷ 1000 (tests/REFERENCES.md, "Recording storage"; NIST SP 811 SI
 * prefixes).
 */
import { expect, test } from 'vitest';
import { planShootDay } from '../../src/lib/shoot/day-plan';

test('a camera with its own roll hours is planned with them; the others use programme minutes × ratio', () => {
	const plan = planShootDay({
		cameras: [
			{ label: 'A cam', bitrateMbps: 100, rollHours: null },
			{ label: 'B cam', bitrateMbps: 50, rollHours: 1 / 3 }
		],
		programMinutes: 12,
		shootingRatio: 5, // 12 min × 5 = 60 min of rolling for A cam
		cardSizeGB: 64,
		uplinkMbps: 100
	});
	// A cam: 100 Mbit/s × 3600 s ÷ 8 ÷ 1000 = 45 GB
	// (worked example in tests/REFERENCES.md, "Recording storage").
	expect(plan.cameras[0]).toMatchObject({ label: 'A cam', rollSeconds: 3600 });
	expect(plan.cameras[0].gigabytes).toBeCloseTo(45, 10);
	// B cam: 50 Mbit/s × 1200 s ÷ 8 ÷ 1000 = 7.5 GB
	// (worked example in tests/REFERENCES.md, "Recording storage").
	expect(plan.cameras[1].rollSeconds).toBeCloseTo(1200, 6);
	expect(plan.cameras[1].gigabytes).toBeCloseTo(7.5, 10);
	expect(plan.totalGigabytes).toBeCloseTo(52.5, 10);
	// Upload: 52.5 GB × 8000 ÷ 100 Mbit/s = 4200 s (hand-worked).
	expect(plan.uploadSeconds).toBeCloseTo(4200, 6);
	// Cards at 64 GB × 0.97 usable = 62.08 GB: A needs 1 (45 GB), B needs 1 (7.5 GB).
	expect(plan.totalCards).toBe(2);
});
