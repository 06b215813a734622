import { SpecError } from './errors';
import { inToMm } from './units';

export const SUSPENSION_TYPES = ['leaf', 'coil', 'torsion', 'strut'] as const;
/** How an axle is sprung: leaf springs, coil springs, torsion bars or struts. */
export type SuspensionType = (typeof SUSPENSION_TYPES)[number];

export const LIFT_METHODS = [
	'lift-block',
	'add-a-leaf',
	'longer-shackle',
	'coil-spacer',
	'strut-spacer',
	'torsion-key',
	'replacement-springs',
	'coilovers'
] as const;
export type LiftMethod = (typeof LIFT_METHODS)[number];

export type Axle = 'front' | 'rear';
/** A different method per axle, e.g. strut spacers up front and a lift block at the rear. */
export type AxleMethods = { front?: LiftMethod | null; rear?: LiftMethod | null };

export const SUSPENSION_LABELS: Record<SuspensionType, string> = {
	leaf: 'leaf springs',
	coil: 'coil springs',
	torsion: 'torsion bars',
	strut: 'struts'
};

export const LIFT_METHOD_LABELS: Record<LiftMethod, string> = {
	'lift-block': 'Lift block',
	'add-a-leaf': 'Add-a-leaf',
	'longer-shackle': 'Longer shackle',
	'coil-spacer': 'Coil spacer',
	'strut-spacer': 'Strut spacer',
	'torsion-key': 'Torsion keys',
	'replacement-springs': 'Replacement springs',
	coilovers: 'Coilovers'
};

/** Which suspension each method is made for (common practice of the trade). */
export const METHOD_FITS: Record<LiftMethod, readonly SuspensionType[]> = {
	'lift-block': ['leaf'],
	'add-a-leaf': ['leaf'],
	'longer-shackle': ['leaf'],
	'coil-spacer': ['coil'],
	'strut-spacer': ['strut'],
	'torsion-key': ['torsion'],
	'replacement-springs': ['leaf', 'coil', 'strut'],
	coilovers: ['coil', 'strut']
};

/** Methods that only move the axle's range of travel higher, and what the note says about each. */
const RIDE_HEIGHT_ONLY_TEXT: Partial<Record<LiftMethod, string>> = {
	'lift-block':
		'A lift block raises ride height but adds no suspension travel: the same range of movement, just higher.',
	'coil-spacer':
		'A coil spacer lift raises ride height but adds no suspension travel: the same range of movement, just higher.',
	'strut-spacer':
		'A strut spacer lift raises ride height but adds no suspension travel: the same range of movement, just higher.',
	'torsion-key':
		'Re-indexed torsion keys raise ride height but add no suspension travel; turning them up also takes away droop and firms the ride.'
};

/** Past about this much lift the trade checks brake lines, driveshaft angles and steering (common practice). */
export const LIFT_CHECKS_THRESHOLD_IN = 2;
/** Beyond this we assume a typo: no bolt-on lift is taller. */
export const MAX_LIFT_IN = 12;

/** Shown with every lift result and lift card. */
export const LIFT_CAUTION =
	'Check local laws on vehicle height, lighting and bumper height, and have steering and brake work inspected by a licensed professional.';

export type FitmentNoteId =
	| 'block-on-front-axle'
	| 'method-does-not-fit'
	| 'no-added-travel'
	| 'over-two-inches-checks'
	| 're-aim-headlights';

export type FitmentNote = {
	id: FitmentNoteId;
	axle: Axle | 'both';
	/** warning: the plan as given is wrong; check: something to inspect; info: what to expect. */
	severity: 'warning' | 'check' | 'info';
	text: string;
	source: 'common practice';
};

export type LiftInput = {
	frontLiftIn: number;
	rearLiftIn: number;
	frontSuspension: SuspensionType;
	rearSuspension: SuspensionType;
	/** One method for every lifted axle, or one per axle. */
	method: LiftMethod | AxleMethods;
};

export type LiftSummary = {
	frontLiftIn: number;
	rearLiftIn: number;
	frontLiftMm: number;
	rearLiftMm: number;
	/** Rear lift minus front lift: positive raises the tail relative to the nose. */
	rakeChangeIn: number;
	rakeChangeMm: number;
	methods: { front: LiftMethod | null; rear: LiftMethod | null };
	/** Warnings first, then checks, then information. */
	notes: FitmentNote[];
	/** Always includes {@link LIFT_CAUTION}. */
	cautions: string[];
};

/**
 * Rake (rear minus front), metric equivalents (1 in = 25.4 mm) and fitment notes for a lift;
 * the notes are rules of thumb of the trade, each marked as common practice.
 */
export function liftSummary(input: LiftInput): LiftSummary {
	const frontLiftIn = checkLift(input.frontLiftIn, 'front');
	const rearLiftIn = checkLift(input.rearLiftIn, 'rear');
	if (frontLiftIn === 0 && rearLiftIn === 0) {
		throw new SpecError('Enter a lift for the front, the rear or both.');
	}
	const suspension: Record<Axle, SuspensionType> = {
		front: checkSuspension(input.frontSuspension, 'front'),
		rear: checkSuspension(input.rearSuspension, 'rear')
	};
	const lift: Record<Axle, number> = { front: frontLiftIn, rear: rearLiftIn };
	const methods = methodsPerAxle(input.method, lift);

	const notes: FitmentNote[] = [];
	for (const axle of ['front', 'rear'] as const) {
		const method = methods[axle];
		if (method) notes.push(...fitmentNotesFor(axle, method, suspension[axle]));
	}
	notes.push(...rideHeightOnlyNotes(methods));
	if (Math.max(frontLiftIn, rearLiftIn) > LIFT_CHECKS_THRESHOLD_IN) {
		notes.push({
			id: 'over-two-inches-checks',
			axle:
				frontLiftIn > LIFT_CHECKS_THRESHOLD_IN && rearLiftIn > LIFT_CHECKS_THRESHOLD_IN
					? 'both'
					: frontLiftIn > LIFT_CHECKS_THRESHOLD_IN
						? 'front'
						: 'rear',
			severity: 'check',
			text: 'Past about 2 in of lift, check brake line length at full droop, driveshaft angles and steering geometry, and consider taller tyres.',
			source: 'common practice'
		});
	}
	notes.push({
		id: 're-aim-headlights',
		axle: 'both',
		severity: 'check',
		text: 'Re-aim the headlights after the lift: the new height and rake move the beam.',
		source: 'common practice'
	});

	const severityOrder = { warning: 0, check: 1, info: 2 } as const;
	notes.sort((a, b) => severityOrder[a.severity] - severityOrder[b.severity]);

	// Subtract the stated figures, then clear binary noise (3 − 2.1 → 0.9, not 0.8999…) at a precision no lift reaches.
	const rakeChangeIn = Number((rearLiftIn - frontLiftIn).toFixed(6));
	return {
		frontLiftIn,
		rearLiftIn,
		frontLiftMm: inToMm(frontLiftIn),
		rearLiftMm: inToMm(rearLiftIn),
		rakeChangeIn,
		rakeChangeMm: inToMm(rearLiftIn) - inToMm(frontLiftIn),
		methods,
		notes,
		cautions: [LIFT_CAUTION]
	};
}

function checkLift(value: number, axle: Axle): number {
	if (typeof value !== 'number' || !Number.isFinite(value)) {
		throw new SpecError(
			`Enter the ${axle} lift in inches as a number, for example 2.5 (0 for none).`
		);
	}
	if (value < 0) {
		throw new SpecError(
			`The ${axle} lift cannot be negative: lift cards cover raising a vehicle, not lowering it.`
		);
	}
	if (value > MAX_LIFT_IN) {
		throw new SpecError(
			`A ${value} in ${axle} lift is more than ${MAX_LIFT_IN} in. Check the number; it is in inches.`
		);
	}
	return value;
}

function checkSuspension(value: SuspensionType, axle: Axle): SuspensionType {
	if (!(SUSPENSION_TYPES as readonly string[]).includes(value)) {
		throw new SpecError(
			`Choose the ${axle} suspension: leaf springs, coil springs, torsion bars or struts.`
		);
	}
	return value;
}

function checkMethod(value: unknown, axle: Axle): LiftMethod {
	if (typeof value !== 'string' || !(LIFT_METHODS as readonly string[]).includes(value)) {
		throw new SpecError(
			`Choose how the ${axle} is lifted: ${Object.values(LIFT_METHOD_LABELS).join(', ').toLowerCase()}.`
		);
	}
	return value as LiftMethod;
}

/** One method applies to each lifted axle; an axle with no lift gets none. */
function methodsPerAxle(
	method: LiftMethod | AxleMethods,
	lift: Record<Axle, number>
): Record<Axle, LiftMethod | null> {
	const result: Record<Axle, LiftMethod | null> = { front: null, rear: null };
	for (const axle of ['front', 'rear'] as const) {
		if (lift[axle] === 0) continue;
		const chosen = typeof method === 'object' && method !== null ? method[axle] : method;
		if (chosen === undefined || chosen === null) {
			throw new SpecError(`Say how the ${axle} is lifted, or set its lift to 0.`);
		}
		result[axle] = checkMethod(chosen, axle);
	}
	return result;
}

function fitmentNotesFor(
	axle: Axle,
	method: LiftMethod,
	suspension: SuspensionType
): FitmentNote[] {
	const label = LIFT_METHOD_LABELS[method];
	if (method === 'lift-block' && axle === 'front') {
		// A block on a steer axle lets the axle twist under braking and steering loads.
		return [
			{
				id: 'block-on-front-axle',
				axle,
				severity: 'warning',
				text: 'A lift block never goes on a front axle. It belongs between a leaf spring and the axle on a rear leaf-sprung axle; lift the front another way.',
				source: 'common practice'
			}
		];
	}
	if (METHOD_FITS[method].includes(suspension)) return [];
	const fitsText = METHOD_FITS[method].map((type) => SUSPENSION_LABELS[type]).join(' or ');
	const text =
		method === 'lift-block'
			? `A lift block fits only between a leaf spring and the axle; the ${axle} has ${SUSPENSION_LABELS[suspension]}.`
			: method === 'coilovers'
				? `Coilovers on ${SUSPENSION_LABELS[suspension]} are a suspension conversion, not a bolt-on: the ${axle} needs new mounts and links.`
				: `${label}: made for ${fitsText}, and the ${axle} has ${SUSPENSION_LABELS[suspension]}.`;
	return [
		{ id: 'method-does-not-fit', axle, severity: 'warning', text, source: 'common practice' }
	];
}

function rideHeightOnlyNotes(methods: Record<Axle, LiftMethod | null>): FitmentNote[] {
	const notes: FitmentNote[] = [];
	const { front, rear } = methods;
	for (const method of new Set([front, rear])) {
		const text = method === null ? undefined : RIDE_HEIGHT_ONLY_TEXT[method];
		if (text === undefined) continue;
		const axle: FitmentNote['axle'] =
			front === method && rear === method ? 'both' : front === method ? 'front' : 'rear';
		notes.push({ id: 'no-added-travel', axle, severity: 'info', text, source: 'common practice' });
	}
	return notes;
}
