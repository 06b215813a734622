/**
 * The storage plan of a shoot day: cameras that state their own roll hours are planned with them,
 * the rest with programme minutes × shooting ratio; the totals add both groups.
 */
import { planStorage, type CameraStorage, type StoragePlan } from './storage';

export interface DayCamera {
	label: string;
	bitrateMbps: number;
	rollHours: number | null;
}

export interface DayPlanInput {
	cameras: DayCamera[];
	programMinutes: number;
	shootingRatio: number;
	cardSizeGB: number;
	uplinkMbps: number;
}

export interface DayPlan {
	cameras: (CameraStorage & { rollSeconds: number })[];
	totalGigabytes: number;
	totalCards: number;
	uploadSeconds: number;
	usableCardGB: number;
}

export function planShootDay(input: DayPlanInput): DayPlan {
	const base = {
		programMinutes: input.programMinutes,
		shootingRatio: input.shootingRatio,
		cardSizeGB: input.cardSizeGB,
		uplinkMbps: input.uplinkMbps
	};
	const plans: StoragePlan[] = [];
	const byRatio = input.cameras.filter((c) => c.rollHours == null);
	if (byRatio.length) plans.push(planStorage({ ...base, cameras: byRatio }));
	for (const camera of input.cameras.filter((c) => c.rollHours != null)) {
		plans.push(planStorage({ ...base, cameras: [camera], rollHoursOverride: camera.rollHours! }));
	}
	const cameras = plans.flatMap((plan) =>
		plan.cameras.map((c) => ({ ...c, rollSeconds: plan.rollSeconds }))
	);
	const order = new Map(input.cameras.map((c, i) => [c.label, i]));
	cameras.sort((a, b) => (order.get(a.label) ?? 0) - (order.get(b.label) ?? 0));
	return {
		cameras,
		totalGigabytes: plans.reduce((sum, p) => sum + p.totalGigabytes, 0),
		totalCards: plans.reduce((sum, p) => sum + p.totalCards, 0),
		uploadSeconds: plans.reduce((sum, p) => sum + p.uploadSeconds, 0),
		usableCardGB: plans[0]?.usableCardGB ?? 0
	};
}
