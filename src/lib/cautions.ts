/**
 * The fixed list of hazards a rundown segment can be flagged with, and the
 * default wording of each caution card. Pure; shared by the rundown editor,
 * the on-screen caution cards and the publish kit.
 *
 * The wording is our own: plain, short sentences that fit on screen (at most
 * CAUTION_MAX_CHARACTERS), stating the usual workshop precautions and pointing
 * to manufacturer instructions and licensed professionals. Crews may edit a
 * segment's caution; these are the starting text.
 */

export const HAZARD_IDS = [
	'raised-vehicle',
	'compressed-springs',
	'heat-torch',
	'cutting-grinding',
	'brakes',
	'steering',
	'airbags-electrical',
	'tyre-inflation',
	'road-test'
] as const;

export type HazardId = (typeof HAZARD_IDS)[number];

export interface Hazard {
	id: HazardId;
	/** Short name shown on the flag in the rundown. */
	label: string;
	/** Caution card text shown on screen when the segment plays. */
	defaultCaution: string;
}

/** Our own on-screen limit: a caution card must be readable in the few seconds it is shown. */
export const CAUTION_MAX_CHARACTERS = 140;

/**
 * How long a caution card may be shown, in seconds (our own bounds, the same as a spec card's);
 * the shortest it may be is its reading time ($lib/reading-time), 9 s for the longest card.
 */
export const CAUTION_SECONDS_LIMITS = { min: 1, max: 60 } as const;

const hazardList: Hazard[] = [
	{
		id: 'raised-vehicle',
		label: 'Vehicle raised on stands',
		defaultCaution:
			'Use rated jack stands on solid, level ground. Never work under a vehicle held up only by a jack.'
	},
	{
		id: 'compressed-springs',
		label: 'Compressed springs',
		defaultCaution:
			'Use a proper spring compressor. Never remove a strut top nut while the spring is still under load.'
	},
	{
		id: 'heat-torch',
		label: 'Heat or torch',
		defaultCaution:
			'Keep a fire extinguisher in reach, clear away fuel and anything flammable, and wear eye and hand protection.'
	},
	{
		id: 'cutting-grinding',
		label: 'Cutting or grinding',
		defaultCaution:
			'Wear eye, ear and hand protection. Keep sparks away from fuel lines and anything flammable.'
	},
	{
		id: 'brakes',
		label: 'Brakes',
		defaultCaution:
			'Brakes are safety-critical: have the work inspected by a licensed professional before the vehicle is driven.'
	},
	{
		id: 'steering',
		label: 'Steering',
		defaultCaution:
			'Steering is safety-critical: have the work inspected by a licensed professional before the vehicle is driven.'
	},
	{
		id: 'airbags-electrical',
		label: 'Airbags or electrical',
		defaultCaution:
			"Disconnect the battery and wait the time given in the manufacturer's instructions before working near airbags or wiring."
	},
	{
		id: 'tyre-inflation',
		label: 'Tyre mounting and inflation',
		defaultCaution:
			'Seat beads in a tyre cage with a clip-on chuck, standing clear. Never exceed the seating pressure printed on the tyre.'
	},
	{
		id: 'road-test',
		label: 'Road test',
		defaultCaution:
			'Check wheels, brakes and steering before driving. Test on a closed course or where the law allows, within the limits.'
	}
];

/** The fixed hazard list, in the order the rundown shows the flags. Frozen: edit a segment's copy, never these. */
export const HAZARDS: readonly Readonly<Hazard>[] = Object.freeze(
	hazardList.map((hazard) => Object.freeze(hazard))
);

/** For episode descriptions and the publish kit: the video is general information and defers to the people and papers that govern the reader's vehicle. */
/** Under the cautions where the crew plans or writes hazardous work (script, rundown, shot list). */
export const SCRIPT_SAFETY_LINE =
	"Film and present this work as the manufacturer's instructions say; local codes and the shop's licensed staff come before the shot.";

export const GENERAL_SAFETY_NOTE =
	"This video is general information, not instructions for your vehicle. Follow the manufacturer's instructions for your vehicle and parts, " +
	'and your local codes and laws. Have safety-critical work done or inspected by a licensed professional. You are responsible for your own safety.';

/** For lift and tyre episodes: changes to ride height can affect whether a vehicle is road-legal. */
export const LIFT_LAW_NOTE =
	'Lifts and larger tyres can change whether a vehicle is road-legal where you live. ' +
	'Check your local laws on lift height, lighting and bumper height before driving it on the road.';

const hazardsById = new Map<string, Hazard>(HAZARDS.map((hazard) => [hazard.id, hazard]));

/** Whether a stored or submitted string is one of the fixed hazard ids. */
export function isHazardId(value: unknown): value is HazardId {
	return typeof value === 'string' && hazardsById.has(value);
}

/** The hazard for an id; undefined only for a string that is not a hazard id. */
export function hazardById(id: HazardId): Hazard;
export function hazardById(id: string): Hazard | undefined;
export function hazardById(id: string): Hazard | undefined {
	return hazardsById.get(id);
}
