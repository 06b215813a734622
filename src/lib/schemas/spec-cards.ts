/**
 * Shapes of what the editor sends about an episode's spec cards: shared by the API routes, the
 * spec-cards page's form actions and its live preview in the browser. The card itself is checked
 * twice in the same way everywhere: its shape by specCardInputSchema, its numbers by renderSpecCard
 * (the tyre parser, the torque and lift checks), so the message next to a field in the browser is
 * the one the server would answer with.
 */
import { z } from 'zod';
import {
	isSpecError,
	parseTyreSize,
	renderSpecCard,
	specCardInputSchema,
	type SpecCard,
	type SpecCardInput,
	type SpecCardKind
} from '../specs';
import { MAX_FRAMES, text, recordVersion, wholeNumber } from './fields';

export const SPEC_CARD_KINDS = [
	'tyre-change',
	'torque',
	'lift',
	'tyre',
	'text'
] as const satisfies readonly SpecCardKind[];

/** Words the crew reads for each kind of card. */
export const SPEC_CARD_KIND_LABELS: Record<SpecCardKind, string> = {
	tyre: 'Tyre size',
	'tyre-change': 'Tyre change',
	torque: 'Torque',
	lift: 'Lift',
	text: 'Text'
};

/** What each kind is for, shown under the kind picker. */
export const SPEC_CARD_KIND_HINTS: Record<SpecCardKind, string> = {
	tyre: 'One size: diameter, width, sidewall and revolutions, worked out from the code on the sidewall.',
	'tyre-change':
		'Old size to new: diameter change, how much the axle rises, and the true speed on the speedometer.',
	torque: 'A torque figure in both units, with the caution to check the maker’s instructions.',
	lift: 'Front and rear lift, the rake change, and the fitment notes of the trade.',
	text: 'A heading and a short line of your own, for anything the others don’t cover.'
};

/** How long a card stays on screen unless the editor says otherwise: long enough to read six short lines (our own choice). */
export const DEFAULT_ON_SCREEN_SECONDS = 6;
export const ON_SCREEN_SECONDS_LIMITS = { min: 1, max: 60 } as const;

/** A timecode or a clock time as typed; parsed on the server at the episode's frame rate. */
const programTimeSchema = text(
	'Type the program time as a timecode or a clock time, e.g. 00:04:20;00 or 4:20.'
)
	.trim()
	.min(1, 'Type the program time as a timecode or a clock time, e.g. 00:04:20;00 or 4:20.')
	.max(40, 'That time is far too long; type it as HH:MM:SS:FF or M:SS.');

const atFrameSchema = wholeNumber({
	error: 'The program time in frames is a whole number.',
	min: 0,
	max: MAX_FRAMES,
	tooSmall: 'The program time in frames is 0 or more.',
	tooBig: 'That frame is far past any cut.'
});

const segmentIdSchema = z
	.uuid({ error: 'Pick a segment of this episode’s rundown, or none.' })
	.nullable();

const onScreenSecondsSchema = z
	.number({ error: 'Say how many seconds the card stays on screen, e.g. 6.' })
	.min(
		ON_SCREEN_SECONDS_LIMITS.min,
		`A card needs at least ${ON_SCREEN_SECONDS_LIMITS.min} s on screen to be read.`
	)
	.max(
		ON_SCREEN_SECONDS_LIMITS.max,
		`Keep a card on screen for ${ON_SCREEN_SECONDS_LIMITS.max} s or less; split it if there is more to say.`
	);

const placement = {
	segmentId: segmentIdSchema.optional(),
	/** Program time as typed; null takes the card off the cut. */
	at: programTimeSchema.nullable().optional(),
	/** Program time as a frame count at the episode's rate (what the timeline sends). */
	atFrame: atFrameSchema.nullable().optional(),
	durationSeconds: onScreenSecondsSchema.optional()
};

const oneWayToPlace = (input: { at?: string | null; atFrame?: number | null }) =>
	input.at === undefined || input.atFrame === undefined;
const oneWayMessage = {
	path: ['at'],
	message: 'Say where the card goes either as text in at or as a frame count in atFrame, not both.'
};

export const specCardCreateSchema = z
	.object({ input: specCardInputSchema, ...placement })
	.strict()
	.refine(oneWayToPlace, oneWayMessage);

export const specCardUpdateSchema = z
	.object({ version: recordVersion, input: specCardInputSchema.optional(), ...placement })
	.strict()
	.refine(oneWayToPlace, oneWayMessage);

export const SPEC_CARD_EXPORT_FORMATS = ['csv', 'json'] as const;
export type SpecCardExportFormat = (typeof SPEC_CARD_EXPORT_FORMATS)[number];
export const specCardExportFormatSchema = z.enum(SPEC_CARD_EXPORT_FORMATS, {
	error: 'Pick an export format: csv or json.'
});

export type SpecCardCreate = z.infer<typeof specCardCreateSchema>;
export type SpecCardUpdate = z.infer<typeof specCardUpdateSchema>;

export type SpecCardCheck =
	| { ok: true; input: SpecCardInput; card: SpecCard }
	| { ok: false; field: string; message: string };

/** The first field a SpecError belongs to, so its message sits next to what has to change. */
function fieldOfSpecError(input: SpecCardInput): string {
	switch (input.kind) {
		case 'tyre':
			return 'size';
		case 'tyre-change':
			try {
				parseTyreSize(input.from);
			} catch {
				return 'from';
			}
			return 'to';
		case 'torque':
			return 'value';
		case 'lift':
			// Lift messages name the axle they are about; they belong to the lift as a whole.
			return 'lift';
		case 'text':
			return 'body';
	}
}

/** Checks a card's shape and numbers; the message is the parser's own, tied to the field it is about. */
export function checkSpecCard(candidate: unknown): SpecCardCheck {
	const shaped = specCardInputSchema.safeParse(candidate);
	if (!shaped.success) {
		const issue = shaped.error.issues[0];
		return {
			ok: false,
			field: issue?.path.length ? issue.path.join('.') : 'kind',
			message: issue?.message ?? 'That card is incomplete. Check its fields.'
		};
	}
	try {
		return { ok: true, input: shaped.data, card: renderSpecCard(shaped.data) };
	} catch (failure) {
		if (isSpecError(failure))
			return { ok: false, field: fieldOfSpecError(shaped.data), message: failure.message };
		throw failure;
	}
}

/**
 * Every problem a card has, by field, for the live preview: the shape first, then each typed tyre
 * size on its own (so a bad new size shows while the old one is still empty), then the numbers.
 */
export function specCardProblems(candidate: unknown): Record<string, string> {
	const problems: Record<string, string> = {};
	const shaped = specCardInputSchema.safeParse(candidate);
	if (!shaped.success) {
		for (const issue of shaped.error.issues)
			problems[issue.path.length ? issue.path.join('.') : 'kind'] ??= issue.message;
	}
	const fields = (typeof candidate === 'object' && candidate !== null ? candidate : {}) as Record<
		string,
		unknown
	>;
	const sizeFields =
		fields.kind === 'tyre' ? ['size'] : fields.kind === 'tyre-change' ? ['from', 'to'] : [];
	for (const field of sizeFields) {
		const typed = fields[field];
		if (typeof typed !== 'string' || typed.trim() === '' || problems[field]) continue;
		try {
			parseTyreSize(typed);
		} catch (failure) {
			if (!isSpecError(failure)) throw failure;
			problems[field] = failure.message;
		}
	}
	if (shaped.success) {
		const checked = checkSpecCard(shaped.data);
		if (!checked.ok) problems[checked.field] ??= checked.message;
	}
	return problems;
}

/** The form fields of each kind, by the names the inputs carry (the same as the input's keys). */
export type SpecCardFormValues = Record<string, string>;

/** A number typed in a form: empty stays undefined (so the schema says "enter a number"), commas read as decimal points. */
function typedNumber(text: string | undefined): number | undefined {
	const trimmed = (text ?? '').trim();
	if (trimmed === '') return undefined;
	return Number(trimmed.replace(',', '.'));
}

const typedText = (text: string | undefined) => {
	const trimmed = (text ?? '').trim();
	return trimmed === '' ? undefined : trimmed;
};

/** The card input a form describes (unchecked): the page's live preview and its form actions read forms the same way. */
export function specCardInputFromForm(values: SpecCardFormValues): unknown {
	const kind = values.kind ?? '';
	switch (kind) {
		case 'tyre':
			return { kind, size: values.size ?? '' };
		case 'tyre-change':
			return { kind, from: values.from ?? '', to: values.to ?? '' };
		case 'torque':
			return {
				kind,
				value: typedNumber(values.value),
				unit: values.unit ?? '',
				fastener: typedText(values.fastener)
			};
		case 'lift':
			return {
				kind,
				frontLiftIn: typedNumber(values.frontLiftIn) ?? 0,
				rearLiftIn: typedNumber(values.rearLiftIn) ?? 0,
				frontSuspension: values.frontSuspension ?? '',
				rearSuspension: values.rearSuspension ?? '',
				method: {
					front: typedText(values['method.front']) ?? null,
					rear: typedText(values['method.rear']) ?? null
				}
			};
		case 'text':
			return { kind, heading: values.heading ?? '', body: values.body ?? '' };
		default:
			return { kind };
	}
}

/** The form fields that describe a stored card, for filling the form when the editor changes it. */
export function specCardFormValues(input: SpecCardInput): SpecCardFormValues {
	switch (input.kind) {
		case 'tyre':
			return { kind: input.kind, size: input.size };
		case 'tyre-change':
			return { kind: input.kind, from: input.from, to: input.to };
		case 'torque':
			return {
				kind: input.kind,
				value: String(input.value),
				unit: input.unit,
				fastener: input.fastener ?? ''
			};
		case 'lift': {
			const method =
				typeof input.method === 'string'
					? { front: input.method, rear: input.method }
					: input.method;
			return {
				kind: input.kind,
				frontLiftIn: String(input.frontLiftIn),
				rearLiftIn: String(input.rearLiftIn),
				frontSuspension: input.frontSuspension,
				rearSuspension: input.rearSuspension,
				'method.front': input.frontLiftIn > 0 ? (method.front ?? '') : '',
				'method.rear': input.rearLiftIn > 0 ? (method.rear ?? '') : ''
			};
		}
		case 'text':
			return { kind: input.kind, heading: input.heading, body: input.body };
	}
}
