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
	type SpecCardInput
} from '../specs';
import { MAX_FRAMES, text, recordVersion, wholeNumber } from './fields';

import {
	DEFAULT_ON_SCREEN_SECONDS,
	ON_SCREEN_SECONDS_LIMITS,
	SPEC_CARD_KINDS,
	SPEC_CARD_KIND_HINTS,
	SPEC_CARD_KIND_LABELS,
	offerSpecCardChecks,
	specCardFormValues,
	specCardInputFromForm,
	type SpecCardFormValues
} from './spec-cards-form';
export {
	DEFAULT_ON_SCREEN_SECONDS,
	ON_SCREEN_SECONDS_LIMITS,
	SPEC_CARD_KINDS,
	SPEC_CARD_KIND_HINTS,
	SPEC_CARD_KIND_LABELS,
	specCardFormValues,
	specCardInputFromForm,
	type SpecCardFormValues
};

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

// The page's live preview asks `./spec-cards-form` for these; this module offers them once it is loaded
// (on the server by the page's actions, in the browser by the form when it mounts).
offerSpecCardChecks({ checkSpecCard, specCardProblems });
