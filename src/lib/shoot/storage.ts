/**
 * Storage planner for a shoot day: how much each camera will record, how many
 * cards that takes, and how long the rushes take to upload. Pure.
 *
 * Units are decimal throughout, as camera and card makers label them:
 * 1 GB = 10^9 bytes = 8,000 Mbit, 1 Mbit/s = 10^6 bit/s. So
 * GB = Mbit/s × seconds ÷ 8 ÷ 1000, and upload seconds = GB × 8000 ÷ Mbit/s.
 *
 * Roll time (what each camera records on the day) comes from the planned
 * finished runtime times the shooting ratio: a 12-minute episode at 10:1 rolls
 * 120 minutes per camera. The ratio is applied once, here, and nowhere else.
 * `rollHoursOverride` replaces that estimate when the crew knows better
 * (for example a locked-off camera that runs all day).
 */

/** Our own allowance: count only 97% of a card's nominal size, since file-system overhead makes real capacity slightly less. */
export const USABLE_CARD_FRACTION = 0.97;

/** A bad planner input, with the field it concerns so a form can show the message beside it. */
export class PlannerError extends Error {
	readonly field: string;
	constructor(field: string, message: string) {
		super(message);
		this.name = 'PlannerError';
		this.field = field;
	}
}

/** One camera setup; `count` bodies recording the same format (default 1). */
export interface CameraSetup {
	label: string;
	bitrateMbps: number;
	count?: number;
}

export interface StoragePlanInput {
	cameras: readonly CameraSetup[];
	/** Planned finished runtime of the episode, in minutes. */
	programMinutes: number;
	/** Footage recorded per minute of finished runtime: 10 for 10:1. */
	shootingRatio: number;
	/** Nominal card size as printed on the card, decimal GB. */
	cardSizeGB: number;
	/** Upload speed available for the rushes, Mbit/s. */
	uplinkMbps: number;
	/** Hours each camera rolls, replacing programMinutes × shootingRatio when given. */
	rollHoursOverride?: number;
}

export interface CameraStorage {
	label: string;
	count: number;
	bitrateMbps: number;
	/** Recorded by one body of this camera. */
	gigabytesPerCamera: number;
	/** Recorded by all `count` bodies together. */
	gigabytes: number;
	/** Cards one body fills, at the usable card size. */
	cardsPerCamera: number;
	/** Cards for all bodies: each body records to its own cards. */
	cards: number;
	/** Time to upload everything this camera setup records. */
	uploadSeconds: number;
}

export interface StoragePlan {
	/** How long each camera rolls, in seconds. */
	rollSeconds: number;
	/** Where the roll time came from. */
	rollTimeSource: 'shooting-ratio' | 'override';
	/** Card size counted as usable: nominal × USABLE_CARD_FRACTION. */
	usableCardGB: number;
	cameras: CameraStorage[];
	totalGigabytes: number;
	/** Cards for the day if none is offloaded and reused. */
	totalCards: number;
	uploadSeconds: number;
}

function requirePositive(value: number | undefined, field: string, message: string): number {
	if (typeof value !== 'number' || !Number.isFinite(value) || value <= 0) {
		throw new PlannerError(field, message);
	}
	return value;
}

/** Gigabytes recorded at a bitrate for a time: GB = Mbit/s × s ÷ 8 ÷ 1000 (decimal units). */
export function gigabytesRecorded(bitrateMbps: number, seconds: number): number {
	return (bitrateMbps * seconds) / 8 / 1000;
}

/** Seconds to move gigabytes over a link: s = GB × 8000 ÷ Mbit/s (decimal units). */
export function uploadSecondsFor(gigabytes: number, uplinkMbps: number): number {
	return (gigabytes * 8000) / uplinkMbps;
}

/** Cards needed for an amount of footage: ceil(GB ÷ usable card GB), ignoring floating-point dust at exact multiples. */
export function cardsNeeded(gigabytes: number, usableCardGB: number): number {
	const exact = gigabytes / usableCardGB;
	// 2 × 62.08 GB ÷ 62.08 GB can come out as 2.0000000000000004; that is two cards, not three.
	return Math.ceil(exact - 1e-9 * Math.max(1, exact));
}

/** Plans recording storage, cards and upload time for a shoot day (formulas in this module's header). */
export function planStorage(input: StoragePlanInput): StoragePlan {
	if (!Array.isArray(input.cameras) || input.cameras.length === 0) {
		throw new PlannerError('cameras', 'Add at least one camera to plan storage for.');
	}
	const programMinutes = requirePositive(
		input.programMinutes,
		'programMinutes',
		'Planned runtime must be more than 0 minutes.'
	);
	const shootingRatio = requirePositive(
		input.shootingRatio,
		'shootingRatio',
		'Shooting ratio must be a number like 10 (for 10:1).'
	);
	if (shootingRatio < 1) {
		throw new PlannerError(
			'shootingRatio',
			'Shooting ratio must be at least 1 (1:1): a camera cannot record less than the finished runtime it covers.'
		);
	}
	const cardSizeGB = requirePositive(
		input.cardSizeGB,
		'cardSizeGB',
		'Card size must be more than 0 GB.'
	);
	const uplinkMbps = requirePositive(
		input.uplinkMbps,
		'uplinkMbps',
		'Upload speed must be more than 0 Mbit/s.'
	);
	const rollHoursOverride =
		input.rollHoursOverride === undefined
			? undefined
			: requirePositive(
					input.rollHoursOverride,
					'rollHoursOverride',
					'Roll time must be more than 0 hours, or left empty.'
				);

	const rollSeconds =
		rollHoursOverride !== undefined
			? rollHoursOverride * 3600
			: programMinutes * shootingRatio * 60;
	const usableCardGB = cardSizeGB * USABLE_CARD_FRACTION;

	const cameras = input.cameras.map((camera, index): CameraStorage => {
		const label = typeof camera.label === 'string' ? camera.label.trim() : '';
		if (label === '') {
			throw new PlannerError(
				`cameras.${index}.label`,
				`Camera ${index + 1} needs a name (for example "A-cam").`
			);
		}
		const bitrateMbps = requirePositive(
			camera.bitrateMbps,
			`cameras.${index}.bitrateMbps`,
			`${label}: bitrate must be more than 0 Mbit/s (check the recording format in the camera's menu).`
		);
		const count = camera.count ?? 1;
		if (!Number.isInteger(count) || count < 1) {
			throw new PlannerError(
				`cameras.${index}.count`,
				`${label}: number of cameras must be a whole number, 1 or more.`
			);
		}
		const gigabytesPerCamera = gigabytesRecorded(bitrateMbps, rollSeconds);
		const gigabytes = gigabytesPerCamera * count;
		const cardsPerCamera = cardsNeeded(gigabytesPerCamera, usableCardGB);
		return {
			label,
			count,
			bitrateMbps,
			gigabytesPerCamera,
			gigabytes,
			cardsPerCamera,
			cards: cardsPerCamera * count,
			uploadSeconds: uploadSecondsFor(gigabytes, uplinkMbps)
		};
	});

	const totalGigabytes = cameras.reduce((sum, camera) => sum + camera.gigabytes, 0);
	return {
		rollSeconds,
		rollTimeSource: rollHoursOverride !== undefined ? 'override' : 'shooting-ratio',
		usableCardGB,
		cameras,
		totalGigabytes,
		totalCards: cameras.reduce((sum, camera) => sum + camera.cards, 0),
		uploadSeconds: uploadSecondsFor(totalGigabytes, uplinkMbps)
	};
}

/**
 * Formats a planning duration for people, rounded up so a plan never promises
 * too little: "45 s", "12 min 05 s", "2 h 05 min" (minutes shown from 1 hour up).
 */
export function formatDuration(seconds: number): string {
	if (!Number.isFinite(seconds) || seconds < 0) {
		throw new RangeError(`A duration must be 0 seconds or more (got ${seconds}).`);
	}
	const wholeSeconds = Math.max(0, Math.ceil(seconds - 1e-9));
	if (wholeSeconds < 60) return `${wholeSeconds} s`;
	if (wholeSeconds < 3600) {
		const minutes = Math.floor(wholeSeconds / 60);
		return `${minutes} min ${String(wholeSeconds % 60).padStart(2, '0')} s`;
	}
	const wholeMinutes = Math.ceil(wholeSeconds / 60);
	const hours = Math.floor(wholeMinutes / 60);
	return `${hours} h ${String(wholeMinutes % 60).padStart(2, '0')} min`;
}
