/**
 * Shapes of what the editor sends about the cut and its chapters: shared by the API routes, the
 * edit page's form actions and its client. Only the shape is checked here; the chapter rules
 * (first at 0:00, at least three, 10 s each, …) are reported by the server, never refused, so a
 * list can be half-finished while the editor works on it.
 */
import { z } from 'zod';
import { CHAPTER_FORMATS, type ChapterFormat } from '$lib/chapters';
import { INT_MAX, MAX_FRAMES, text, recordVersion, wholeNumber } from './fields';

/** Longest title accepted at all; the chapter rules ask for 100 or fewer and say so per chapter. */
export const CHAPTER_TITLE_HARD_LIMIT = 500;

/** A timecode or a clock time as typed; parsed on the server at the episode's frame rate. */
export const timeTextSchema = text('Type a timecode or a clock time, e.g. 00:13:40;00 or 13:40.')
	.trim()
	.min(1, 'Type a timecode or a clock time, e.g. 00:13:40;00 or 13:40.')
	.max(40, 'That time is far too long; type it as HH:MM:SS:FF or M:SS.');

const startFrameSchema = wholeNumber({
	error: 'The start frame is a whole number of frames.',
	min: 0,
	max: MAX_FRAMES,
	tooSmall: 'The start frame is 0 or more.',
	tooBig: 'That start frame is far past any cut.'
});

const titleSchema = text('Give the chapter a title.').max(
	CHAPTER_TITLE_HARD_LIMIT,
	`Keep the title well under ${CHAPTER_TITLE_HARD_LIMIT} characters (chapters read best under 100).`
);

/** A link for the chapter (a featured part's shop page): http or https only, or null to clear it. */
const urlSchema = text('The link is a web address.')
	.trim()
	.max(2000, 'That link is too long.')
	.refine(
		(text) => text === '' || (/^https?:\/\/\S+$/i.test(text) && URL.canParse(text)),
		'The link has to be a web address starting with http:// or https://.'
	)
	.transform((text) => (text === '' ? null : text))
	.nullable();

export const cutUpdateSchema = z
	.object({
		duration: timeTextSchema,
		/** The length the editor last saw; when given and stale the server answers 409. */
		expectedFrames: wholeNumber({
			error: 'expectedFrames is the cut’s length you last saw, in frames.',
			min: 1,
			max: INT_MAX
		})
			.nullable()
			.optional()
	})
	.strict();

export const chapterCreateSchema = z
	.object({
		start: timeTextSchema.optional(),
		startFrame: startFrameSchema.optional(),
		title: titleSchema,
		url: urlSchema.optional(),
		partId: z.uuid({ error: 'partId is the id of a part.' }).nullable().optional()
	})
	.strict()
	.refine((input) => (input.start === undefined) !== (input.startFrame === undefined), {
		path: ['start'],
		message:
			'Say where the chapter starts: a timecode or clock time in start, or a frame count in startFrame (one of them).'
	});

export const chapterUpdateSchema = z
	.object({
		version: recordVersion,
		start: timeTextSchema.optional(),
		startFrame: startFrameSchema.optional(),
		title: titleSchema.optional(),
		url: urlSchema.optional(),
		partId: z.uuid({ error: 'partId is the id of a part.' }).nullable().optional()
	})
	.strict()
	.refine((input) => input.start === undefined || input.startFrame === undefined, {
		path: ['start'],
		message:
			'Send the new start either as text in start or as a frame count in startFrame, not both.'
	});

export const chapterFormatSchema = z.enum(
	CHAPTER_FORMATS as unknown as [ChapterFormat, ...ChapterFormat[]],
	{
		error: `Pick an export format: ${CHAPTER_FORMATS.join(', ')}.`
	}
);

export type CutUpdate = z.infer<typeof cutUpdateSchema>;
export type ChapterCreate = z.infer<typeof chapterCreateSchema>;
export type ChapterUpdate = z.infer<typeof chapterUpdateSchema>;

/** One end of a segment's span on the timeline as typed; '' (or null from JSON) clears it. */
const spanPointSchema = z.preprocess(
	(value) => (value === null ? '' : value),
	text('Type a timecode or a clock time, e.g. 00:04:05;00 or 4:05.')
		.trim()
		.max(40, 'That time is far too long; type it as HH:MM:SS:FF or M:SS.')
);

/**
 * Where a rundown segment sits in the cut: its in and out points on the edit timeline (timecode
 * or clock text at the episode's rate, out exclusive). Both, or neither to take it off the
 * timeline; the server checks in before out and both inside the cut.
 */
export const segmentSpanSchema = z
	.object({ version: recordVersion, in: spanPointSchema, out: spanPointSchema })
	.strict()
	.superRefine((span, context) => {
		if (span.in === '' && span.out !== '')
			context.addIssue({
				code: 'custom',
				path: ['in'],
				message: 'Type the in point too, or clear both to take the segment off the timeline.'
			});
		if (span.out === '' && span.in !== '')
			context.addIssue({
				code: 'custom',
				path: ['out'],
				message: 'Type the out point too, or clear both to take the segment off the timeline.'
			});
	});

export type SegmentSpanUpdate = z.infer<typeof segmentSpanSchema>;
