/**
 * Shapes of what people type about episodes, their rundown, scripts, cautions, shots, stage moves
 * and builds: shared by the form actions, the API routes and the client.
 */
import { z } from 'zod';
import { HAZARD_IDS, CAUTION_MAX_CHARACTERS, CAUTION_SECONDS_LIMITS } from '$lib/cautions';
import { SEGMENT_KINDS, parseDurationText } from '$lib/rundown';
import { STAGES } from '$lib/stages';
import { SUSPENSION_TYPES, LIFT_METHODS, MAX_LIFT_IN } from '$lib/specs/lift';
import { parseTyreSize } from '$lib/specs/tyres';
import { isSpecError } from '$lib/specs/errors';
import { FRAME_RATE_VALUES } from './people';
import { MAX_FRAMES, calendarDate, text, recordVersion, wholeNumber } from './fields';
import { pageQueryFields } from './paging';

import { SCRIPT_CHARACTER_LIMIT } from './episodes-constants';
export { SCRIPT_CHARACTER_LIMIT };

/** Our own ceilings: a how-to episode runs minutes, not hours; a segment ten minutes at most in practice. */
export const MAX_TARGET_RUNTIME_SECONDS = 4 * 3600;
export const MAX_SEGMENT_SECONDS = 10 * 3600;
export const MAX_SEGMENTS_PER_EPISODE = 200;

const uuid = (what: string) =>
	z
		.string({ error: `Pick ${what}.` })
		.regex(
			/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i,
			`That is not ${what} of this channel.`
		);

/** A duration typed as seconds, `m:ss` or `1m30s`, or sent as a number of seconds. */
export function durationSchema(what: string, max: number) {
	return z
		.union([z.number(), z.string()], { error: `Enter the ${what} as minutes:seconds, e.g. 1:30.` })
		.transform((value, context) => {
			const text = String(value).trim();
			if (/^[-−]/.test(text)) {
				context.addIssue({
					code: 'custom',
					message: `The ${what} can’t be negative. Enter 0 or more, e.g. 1:30.`
				});
				return z.NEVER;
			}
			const seconds = typeof value === 'number' ? value : parseDurationText(text);
			if (seconds === null || !Number.isFinite(seconds)) {
				context.addIssue({
					code: 'custom',
					message: `“${text}” is not a duration. Enter minutes:seconds (1:30) or seconds (90).`
				});
				return z.NEVER;
			}
			if (!Number.isInteger(seconds)) {
				context.addIssue({ code: 'custom', message: `Enter the ${what} in whole seconds.` });
				return z.NEVER;
			}
			if (seconds > max) {
				context.addIssue({
					code: 'custom',
					message: `The ${what} is longer than ${Math.round(max / 3600)} hours: check the number.`
				});
				return z.NEVER;
			}
			return seconds;
		});
}

const title = text('Give it a title.')
	.trim()
	.min(1, 'Give it a title.')
	.max(120, 'Keep the title under 120 characters.');
const slug = text()
	.trim()
	.max(80, 'Keep the slug under 80 characters.')
	.regex(
		/^$|^[a-z0-9]+(?:-[a-z0-9]+)*$/,
		'Use lower-case letters, digits and single hyphens, e.g. mule-rear-block-lift.'
	);
const publishDate = calendarDate('Enter the date as YYYY-MM-DD.', { allowEmpty: true })
	.transform((value) => (value === '' ? null : value))
	.nullable();

import { ASSIGNABLE_ROLES, type AssignableRole } from './episodes-constants';
export { ASSIGNABLE_ROLES, type AssignableRole } from './episodes-constants';

const assignments = z
	.object(
		Object.fromEntries(
			ASSIGNABLE_ROLES.map((role) => [role, uuid('a crew member').nullable().optional()])
		) as Record<AssignableRole, z.ZodOptional<z.ZodNullable<z.ZodString>>>
	)
	.strict();

const episodeFields = {
	title,
	slug: slug.optional(),
	logline: text().trim().max(500, 'Keep the logline under 500 characters.').optional(),
	targetRuntimeSeconds: durationSchema('target runtime', MAX_TARGET_RUNTIME_SECONDS).refine(
		(seconds) => seconds > 0,
		'Give the episode a target runtime above 0, e.g. 12:00.'
	),
	frameRate: z.enum(FRAME_RATE_VALUES, { error: 'Pick one of the listed frame rates.' }),
	/** Programme timecode form: true drop-frame, false non-drop, null the rate's usual form. */
	timecodeDropFrame: z
		.boolean({ error: 'Pick drop-frame or non-drop for the programme timecode.' })
		.nullable()
		.optional(),
	/** The label of the cut's first frame; whether it fits the rate is the domain's check. */
	timecodeStart: text()
		.trim()
		.regex(
			/^\d{2}:\d{2}:\d{2}[:;]\d{2}$/,
			'Write the start timecode as HH:MM:SS:FF, e.g. 01:00:00:00 (00:00:00:00 for none).'
		)
		.optional(),
	publishDate: publishDate.optional(),
	buildIds: z
		.array(uuid('a build'), { error: 'Pick builds from the list.' })
		.max(10, 'Feature at most 10 builds.')
		.optional(),
	assignments: assignments.optional()
};

export const episodeCreateSchema = z.object(episodeFields).strict();
export type EpisodeCreate = z.infer<typeof episodeCreateSchema>;

export const episodeUpdateSchema = z
	.object({
		...episodeFields,
		version: recordVersion
	})
	.partial({ title: true, targetRuntimeSeconds: true, frameRate: true })
	.strict();
export type EpisodeUpdate = z.infer<typeof episodeUpdateSchema>;

export const EPISODE_SORTS = ['publish', 'title', 'stage', 'created'] as const;
export const episodeListQuerySchema = z.object({
	stage: z.enum(STAGES).optional(),
	assignee: uuid('a crew member').optional(),
	from: calendarDate('Enter the date as YYYY-MM-DD.').optional(),
	to: calendarDate('Enter the date as YYYY-MM-DD.').optional(),
	sort: z.enum(EPISODE_SORTS).default('publish'),
	direction: z.enum(['asc', 'desc']).default('asc'),
	...pageQueryFields
});
export type EpisodeListQuery = z.infer<typeof episodeListQuerySchema>;

/** How many episodes the picker offers at once. */
export const EPISODE_PICKER_LIMIT = 20;

/** `?q=&except=&limit=` of the episode picker's search. */
export const episodePickerQuerySchema = z.object({
	q: text().trim().max(120, 'Type at most 120 characters to find an episode.').optional(),
	except: uuid('an episode').optional(),
	limit: wholeNumber({
		coerce: true,
		error: 'Ask for a number of episodes, such as 20.',
		min: 1,
		max: 50,
		tooBig: 'Ask for at most 50 episodes at a time.'
	}).default(EPISODE_PICKER_LIMIT)
});
export type EpisodePickerQuery = z.infer<typeof episodePickerQuerySchema>;

const hazards = z
	.array(z.enum(HAZARD_IDS, { error: 'Pick hazards from the list.' }))
	.max(HAZARD_IDS.length);

const segmentFields = {
	kind: z.enum(SEGMENT_KINDS, { error: 'Pick a kind of segment from the list.' }),
	title: text('Give the segment a title.')
		.trim()
		.min(1, 'Give the segment a title.')
		.max(120, 'Keep the title under 120 characters.'),
	plannedSeconds: durationSchema('planned duration', MAX_SEGMENT_SECONDS),
	buildId: uuid('a build').nullable().optional(),
	needsFootage: z.boolean().optional(),
	hazards: hazards.optional(),
	promiseEpisodeId: uuid('an episode').nullable().optional(),
	promiseTitle: text()
		.trim()
		.max(120, 'Keep the follow-up title under 120 characters.')
		.nullable()
		.optional()
};

export const segmentCreateSchema = z
	.object({ ...segmentFields, plannedSeconds: segmentFields.plannedSeconds.default(0) })
	.strict();
export type SegmentCreate = z.infer<typeof segmentCreateSchema>;

export const segmentUpdateSchema = z
	.object({
		...segmentFields,
		/** Length in the cut: timecode or clock text at the episode's rate, or a frame count; null clears it. */
		recorded: text()
			.trim()
			.max(20, 'That is too long for a length in the cut.')
			.nullable()
			.optional(),
		recordedFrames: wholeNumber({
			error: 'A frame count is a whole number.',
			min: 0,
			max: MAX_FRAMES,
			tooSmall: 'A length can’t be negative.',
			tooBig: 'That length is far past any cut.'
		})
			.nullable()
			.optional(),
		version: recordVersion
	})
	.partial({ kind: true, title: true, plannedSeconds: true })
	.strict();
export type SegmentUpdate = z.infer<typeof segmentUpdateSchema>;

export const segmentDeleteSchema = z.object({ version: recordVersion }).strict();

export const reorderSchema = z
	.object({
		order: z
			.array(
				z
					.string()
					.regex(
						/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i,
						'That is not a segment id.'
					),
				{ error: 'Send the segment ids in their new order.' }
			)
			.min(1, 'Send the segment ids in their new order.')
			.max(MAX_SEGMENTS_PER_EPISODE)
	})
	.strict();

const scriptBody = text('Send the script as text.').max(
	SCRIPT_CHARACTER_LIMIT,
	`A segment’s script is limited to ${SCRIPT_CHARACTER_LIMIT.toLocaleString('en')} characters: split it into two segments.`
);

export const scriptSaveSchema = z
	.object({
		body: scriptBody,
		version: recordVersion
	})
	.strict();
export const scriptPreviewSchema = z.object({ markdown: scriptBody }).strict();

export const cautionUpdateSchema = z
	.object({
		text: text()
			.trim()
			.min(1, 'A caution needs its text; the default wording is a good start.')
			.max(
				CAUTION_MAX_CHARACTERS,
				`Keep a caution under ${CAUTION_MAX_CHARACTERS} characters so it can be read on screen.`
			)
			.optional(),
		/** Where the card appears: timecode or clock text at the episode's rate; '' or null clears it. */
		at: text().trim().max(20, 'That is too long for a time in the cut.').nullable().optional(),
		atFrame: wholeNumber({
			error: 'A frame is a whole number.',
			min: 0,
			max: MAX_FRAMES,
			tooSmall: 'A time in the cut can’t be negative.',
			tooBig: 'That frame is far past any cut.'
		})
			.nullable()
			.optional(),
		/**
		 * How long the card stays on screen, in seconds (a number, or text from a form; '' or null
		 * clears it). The server refuses less than the words need to be read ($lib/reading-time).
		 */
		seconds: z
			.preprocess(
				(value) =>
					typeof value === 'string'
						? value.trim() === ''
							? null
							: Number(value.trim().replace(',', '.'))
						: value,
				z
					.number({ error: 'Type how many seconds the card stays on screen, e.g. 8.' })
					.min(
						CAUTION_SECONDS_LIMITS.min,
						`A caution card needs at least ${CAUTION_SECONDS_LIMITS.min} s on screen.`
					)
					.max(
						CAUTION_SECONDS_LIMITS.max,
						`Keep a caution card on screen for ${CAUTION_SECONDS_LIMITS.max} s or less.`
					)
					.nullable()
			)
			.optional(),
		version: recordVersion
	})
	.strict();
export type CautionUpdate = z.infer<typeof cautionUpdateSchema>;

export const shotCreateSchema = z
	.object({
		what: text('Say what the shot shows.')
			.trim()
			.min(1, 'Say what the shot shows.')
			.max(200, 'Keep it under 200 characters.'),
		angle: text().trim().max(80, 'Keep the angle under 80 characters.').default(''),
		roll: z.enum(['A', 'B'], { error: 'A-roll or B-roll?' }).default('A'),
		camera: text().trim().max(60, 'Keep the camera name under 60 characters.').default(''),
		notes: text().trim().max(500, 'Keep the notes under 500 characters.').default('')
	})
	.strict();
export type ShotCreate = z.infer<typeof shotCreateSchema>;

export const stageMoveSchema = z
	.object({
		to: z.enum(STAGES, { error: 'Pick the stage to move to.' }),
		/** The stage the person saw: a move from a stage the episode already left is refused (409). */
		from: z.enum(STAGES, { error: 'Say which stage the episode is in now.' }),
		note: text().trim().max(1000, 'Keep the note under 1,000 characters.').default('')
	})
	.strict();
export type StageMoveInput = z.infer<typeof stageMoveSchema>;

export const REVIEW_ACTIONS = ['submit', 'approve', 'return', 'comment'] as const;
export const scriptReviewSchema = z
	.object({
		action: z.enum(REVIEW_ACTIONS, { error: 'Submit, approve, return or comment?' }),
		body: text().trim().max(4000, 'Keep the comment under 4,000 characters.').default(''),
		/** The fingerprint of the script the reviewer read; approving a script that changed since is refused. */
		fingerprint: text().max(128).optional(),
		segmentId: uuid('a segment').nullable().optional()
	})
	.strict()
	.refine(
		(value) => !(value.action === 'return' || value.action === 'comment') || value.body.length > 0,
		{ path: ['body'], message: 'Write the comment: say what should change.' }
	);
export type ScriptReviewInput = z.infer<typeof scriptReviewSchema>;

const liftInches = (axle: string) =>
	z.coerce
		.number({ error: `Enter the ${axle} lift in inches, e.g. 2.5 (0 for none).` })
		.min(0, `The ${axle} lift can’t be negative.`)
		.max(
			MAX_LIFT_IN,
			`A ${axle} lift over ${MAX_LIFT_IN} in is almost certainly a typo: it is in inches.`
		);

const optionalChoice = <T extends readonly [string, ...string[]]>(values: T, message: string) =>
	z.preprocess(
		(value) => (value === '' ? null : value),
		z.enum(values, { error: message }).nullable().optional()
	);

export const buildSchema = z
	.object({
		name: text()
			.trim()
			.min(1, 'Give the build a name, e.g. Project Mule.')
			.max(80, 'Keep the name under 80 characters.'),
		year: wholeNumber({
			error: 'Enter the model year, e.g. 2004.',
			coerce: true,
			min: 1900,
			max: 2100,
			tooSmall: 'Enter a model year after 1900.',
			tooBig: 'Enter a real model year.'
		}),
		vehicleType: text()
			.trim()
			.min(1, 'Describe the vehicle, e.g. Midsize pickup, extended cab.')
			.max(120),
		drivetrain: text().trim().min(1, 'Enter the drivetrain, e.g. Part-time 4WD.').max(80),
		frontSuspension: text().trim().min(1, 'Describe the front suspension.').max(120),
		rearSuspension: text().trim().min(1, 'Describe the rear suspension.').max(120),
		frontSpring: optionalChoice(SUSPENSION_TYPES, 'Pick leaf, coil, torsion or strut.'),
		rearSpring: optionalChoice(SUSPENSION_TYPES, 'Pick leaf, coil, torsion or strut.'),
		frontLiftIn: liftInches('front'),
		rearLiftIn: liftInches('rear'),
		frontLiftMethod: optionalChoice(LIFT_METHODS, 'Pick a lift method from the list.'),
		rearLiftMethod: optionalChoice(LIFT_METHODS, 'Pick a lift method from the list.'),
		tyreSize: text()
			.trim()
			.min(1, 'Enter the tyre size from the sidewall, e.g. 285/70R17.')
			.superRefine((value, context) => {
				try {
					parseTyreSize(value);
				} catch (failure) {
					context.addIssue({
						code: 'custom',
						message: isSpecError(failure) ? failure.message : 'That is not a tyre size.'
					});
				}
			}),
		notes: text().trim().max(2000, 'Keep the notes under 2,000 characters.').default(''),
		version: recordVersion.optional()
	})
	.strict();
export type BuildInput = z.infer<typeof buildSchema>;
