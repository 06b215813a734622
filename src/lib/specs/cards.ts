import { z } from 'zod';
import { text } from '../schemas/fields';
import { TEXT_CARD_LIMITS } from './card-limits';
import { SpecError } from './errors';
import {
	LIFT_CAUTION,
	LIFT_METHOD_LABELS,
	LIFT_METHODS,
	SUSPENSION_TYPES,
	liftSummary
} from './lift';
import type { LiftMethod } from './lift';
import { compareTyres } from './tyre-change';
import { parseTyreSize, TYRE_GEOMETRY_NOTE } from './tyres';
import type { TyreSize } from './tyres';
import {
	formatQuantity,
	formatStated,
	inToMm,
	statedDecimals,
	torqueCard,
	TORQUE_UNITS
} from './units';
import type { TorqueUnit } from './units';

/** Printed on every torque card. */
export const TORQUE_CAUTION = "Verify against the manufacturer's instructions.";

export { TEXT_CARD_LIMITS } from './card-limits';

/** Speeds at which a tyre-change card shows the true speed (the usual highway check figures). */
export const SPEEDOMETER_CHECK_SPEEDS = { mph: 60, kmh: 100 } as const;

/**
 * Decimals each figure is shown to on a card. Values the crew typed are shown as typed instead;
 * everything computed is rounded once, from the exact figure, to these.
 */
export const SPEC_CARD_PRECISION = {
	lengthIn: 1,
	/** Half of a length shown to 0.1 in needs one more decimal to read as half of it (1.1 in → 0.55 in). */
	halfLengthIn: 2,
	lengthMm: 0,
	revolutions: 0,
	speed: 1,
	torque: 0
} as const;

const tyreSizeText = text('Enter the tyre size as text, for example 285/70R17.')
	.trim()
	.min(1, 'Enter a tyre size, for example 285/70R17.');

const liftMethodSchema = z.enum(LIFT_METHODS, {
	error: `Choose a lift method: ${LIFT_METHODS.join(', ')}.`
});
const suspensionSchema = z.enum(SUSPENSION_TYPES, {
	error: `Choose a suspension type: ${SUSPENSION_TYPES.join(', ')}.`
});
const inchesSchema = z.number({ error: 'Enter the lift in inches as a number (0 for none).' });

/** Shapes of the on-screen spec cards; the numbers themselves are checked when the card is rendered. */
export const specCardInputSchema = z.discriminatedUnion(
	'kind',
	[
		z.object({ kind: z.literal('tyre'), size: tyreSizeText }),
		z.object({ kind: z.literal('tyre-change'), from: tyreSizeText, to: tyreSizeText }),
		z.object({
			kind: z.literal('torque'),
			value: z.number({ error: 'Enter the torque as a number, for example 95.' }),
			unit: z.enum(TORQUE_UNITS, { error: 'Choose a torque unit: ft·lbf, N·m or in·lbf.' }),
			fastener: text()
				.trim()
				.min(1, 'Name the fastener, or leave it out.')
				.max(
					TEXT_CARD_LIMITS.fastener,
					`Keep the fastener name to ${TEXT_CARD_LIMITS.fastener} characters.`
				)
				.optional()
		}),
		z.object({
			kind: z.literal('lift'),
			frontLiftIn: inchesSchema,
			rearLiftIn: inchesSchema,
			frontSuspension: suspensionSchema,
			rearSuspension: suspensionSchema,
			method: z.union(
				[
					liftMethodSchema,
					z.object({
						front: liftMethodSchema.nullable().optional(),
						rear: liftMethodSchema.nullable().optional()
					})
				],
				{ error: `Choose a lift method: ${LIFT_METHODS.join(', ')}, or one for each axle.` }
			)
		}),
		z.object({
			kind: z.literal('text'),
			heading: text('Enter a heading.')
				.trim()
				.min(1, 'Enter a heading.')
				.max(
					TEXT_CARD_LIMITS.heading,
					`Keep the heading to ${TEXT_CARD_LIMITS.heading} characters.`
				),
			body: text('Enter the text for the card.')
				.trim()
				.min(1, 'Enter the text for the card.')
				.max(TEXT_CARD_LIMITS.body, `Keep the text to ${TEXT_CARD_LIMITS.body} characters.`)
		})
	],
	{ error: 'Choose a card kind: tyre, tyre-change, torque, lift or text.' }
);

export type SpecCardInput = z.infer<typeof specCardInputSchema>;
export type SpecCardKind = SpecCardInput['kind'];

export type SpecCardLine = { label: string; imperial: string; metric: string };

export type SpecCard = {
	kind: SpecCardKind;
	heading: string;
	/** Computed figures as they read on screen, imperial and metric side by side. */
	lines: SpecCardLine[];
	cautions: string[];
	/** Only text cards carry a body. */
	body?: string;
};

/** Turns a card's input into the lines shown on screen; throws SpecError with a message for the crew. */
export function renderSpecCard(input: SpecCardInput): SpecCard {
	const checked = specCardInputSchema.safeParse(input);
	if (!checked.success) {
		throw new SpecError(
			checked.error.issues[0]?.message ?? 'That card is incomplete. Check its fields.'
		);
	}
	const card = checked.data;
	switch (card.kind) {
		case 'tyre':
			return tyreCard(parseTyreSize(card.size));
		case 'tyre-change':
			return tyreChangeCard(parseTyreSize(card.from), parseTyreSize(card.to));
		case 'torque':
			return torqueSpecCard(card.value, card.unit, card.fastener);
		case 'lift':
			return liftCard(card);
		case 'text':
			return { kind: 'text', heading: card.heading, lines: [], cautions: [], body: card.body };
	}
}

function lengthLine(
	label: string,
	inches: number,
	millimetres: number,
	signed = false,
	inchDecimals: number = SPEC_CARD_PRECISION.lengthIn
): SpecCardLine {
	return {
		label,
		imperial: formatQuantity(inches, 'in', inchDecimals, { signed }),
		metric: formatQuantity(millimetres, 'mm', SPEC_CARD_PRECISION.lengthMm, { signed })
	};
}

function tyreCard(size: TyreSize): SpecCard {
	return {
		kind: 'tyre',
		heading: size.code,
		lines: [
			lengthLine(
				size.diameterNominal ? 'Overall diameter (nominal, from the size)' : 'Overall diameter',
				size.diameterIn,
				size.diameterMm
			),
			lengthLine('Section width', size.sectionWidthIn, size.sectionWidthMm),
			lengthLine('Sidewall height', size.sidewallIn, size.sidewallMm),
			{
				label: 'Rim diameter',
				imperial: formatStated(size.rimIn, 'in'),
				metric: formatQuantity(inToMm(size.rimIn), 'mm', SPEC_CARD_PRECISION.lengthMm)
			},
			lengthLine('Circumference', size.circumferenceIn, size.circumferenceMm),
			{
				label: 'Revolutions',
				imperial: formatQuantity(size.revsPerMile, 'per mile', SPEC_CARD_PRECISION.revolutions),
				metric: formatQuantity(size.revsPerKm, 'per km', SPEC_CARD_PRECISION.revolutions)
			}
		],
		cautions: [TYRE_GEOMETRY_NOTE]
	};
}

/** A flotation size's diameter is the nominal one its size names: the label says which. */
function diameterLabel(from: TyreSize, to: TyreSize): string {
	const nominal = [from, to].filter((size) => size.diameterNominal).map((size) => size.code);
	if (nominal.length === 0) return 'Overall diameter';
	return `Overall diameter (${[...new Set(nominal)].join(' and ')} nominal)`;
}

function tyreChangeCard(from: TyreSize, to: TyreSize): SpecCard {
	const change = compareTyres(from, to);
	const { lengthIn, lengthMm, speed, revolutions } = SPEC_CARD_PRECISION;
	return {
		kind: 'tyre-change',
		heading: `${from.code} → ${to.code}`,
		lines: [
			{
				label: diameterLabel(from, to),
				imperial: `${formatQuantity(from.diameterIn, 'in', lengthIn)} → ${formatQuantity(to.diameterIn, 'in', lengthIn)}`,
				metric: `${formatQuantity(from.diameterMm, 'mm', lengthMm)} → ${formatQuantity(to.diameterMm, 'mm', lengthMm)}`
			},
			lengthLine('Diameter change', change.diameterChangeIn, change.diameterChangeMm, true),
			lengthLine(
				'Axle height change (half the diameter change)',
				change.groundClearanceChangeIn,
				change.groundClearanceChangeMm,
				true,
				SPEC_CARD_PRECISION.halfLengthIn
			),
			lengthLine('Width change', change.widthChangeIn, change.widthChangeMm, true),
			{
				label: `True speed at an indicated ${SPEEDOMETER_CHECK_SPEEDS.mph} mph / ${SPEEDOMETER_CHECK_SPEEDS.kmh} km/h`,
				imperial: formatQuantity(change.trueSpeedAt(SPEEDOMETER_CHECK_SPEEDS.mph), 'mph', speed),
				metric: formatQuantity(change.trueSpeedAt(SPEEDOMETER_CHECK_SPEEDS.kmh), 'km/h', speed)
			},
			{
				label: 'Revolutions change',
				imperial: formatQuantity(change.revsPerMileChange, 'per mile', revolutions, {
					signed: true
				}),
				metric: formatQuantity(change.revsPerKmChange, 'per km', revolutions, { signed: true })
			}
		],
		cautions: [...change.cautions, TYRE_GEOMETRY_NOTE]
	};
}

function torqueSpecCard(value: number, unit: TorqueUnit, fastener: string | undefined): SpecCard {
	const torque = torqueCard({ value, unit });
	return {
		kind: 'torque',
		heading: fastener ?? 'Torque',
		lines: [{ label: 'Torque', imperial: torque.imperial, metric: torque.metric }],
		cautions: [TORQUE_CAUTION]
	};
}

function liftCard(card: Extract<SpecCardInput, { kind: 'lift' }>): SpecCard {
	const summary = liftSummary(card);
	const rakeDecimals = Math.max(
		statedDecimals(summary.frontLiftIn),
		statedDecimals(summary.rearLiftIn)
	);
	return {
		kind: 'lift',
		heading: liftHeading(summary.methods),
		lines: [
			{
				label: 'Front lift',
				imperial: formatStated(summary.frontLiftIn, 'in'),
				metric: formatQuantity(summary.frontLiftMm, 'mm', SPEC_CARD_PRECISION.lengthMm)
			},
			{
				label: 'Rear lift',
				imperial: formatStated(summary.rearLiftIn, 'in'),
				metric: formatQuantity(summary.rearLiftMm, 'mm', SPEC_CARD_PRECISION.lengthMm)
			},
			{
				label: 'Rake change (rear minus front)',
				imperial: formatQuantity(summary.rakeChangeIn, 'in', rakeDecimals, { signed: true }),
				metric: formatQuantity(summary.rakeChangeMm, 'mm', SPEC_CARD_PRECISION.lengthMm, {
					signed: true
				})
			}
		],
		cautions: [...summary.notes.map((note) => note.text), LIFT_CAUTION]
	};
}

function liftHeading(methods: { front: LiftMethod | null; rear: LiftMethod | null }): string {
	const { front, rear } = methods;
	if (front && rear && front === rear)
		return `Lift: ${LIFT_METHOD_LABELS[front].toLowerCase()}, front and rear`;
	const parts = [
		front ? `${LIFT_METHOD_LABELS[front].toLowerCase()} front` : null,
		rear ? `${LIFT_METHOD_LABELS[rear].toLowerCase()} rear` : null
	].filter((part) => part !== null);
	return `Lift: ${parts.join(', ')}`;
}
