/**
 * Shapes of what the crew sends in the cut review: version notes, comments, replies, answers,
 * the carry-over offset and the producer's approval. Shared by the API routes and the pages' form
 * actions; the times are read on the server at the episode's programme timecode.
 */
import { z } from 'zod';
import { COMMENT_MAX, CUT_NOTE_MAX } from '$lib/cut-review';
import { MAX_FRAMES, recordVersion, text, wholeNumber } from './fields';
import { timeTextSchema } from './edit';

const frameSchema = (what: string) =>
	wholeNumber({
		error: `The ${what} is a whole number of frames.`,
		min: 0,
		max: MAX_FRAMES,
		tooSmall: `The ${what} is 0 or more.`,
		tooBig: `That ${what} is far past any cut.`,
		coerce: true
	});

export const changeNoteSchema = text('Write what changed in this version.')
	.trim()
	.max(CUT_NOTE_MAX, `Keep the change note under ${CUT_NOTE_MAX} characters.`);

export const versionNoteSchema = z
	.object({ changeNote: changeNoteSchema, version: recordVersion })
	.strict();

const bodySchema = (empty: string) =>
	text(empty).trim().min(1, empty).max(COMMENT_MAX, `Keep it under ${COMMENT_MAX} characters.`);

/** A comment at a typed time (`at`) or a frame (`atFrame`, from the player); `until` makes it a range. */
export const commentCreateSchema = z
	.object({
		versionId: z.uuid({ error: 'Pick the version you watched.' }),
		at: timeTextSchema.optional(),
		atFrame: frameSchema('frame').optional(),
		until: z.union([z.literal(''), timeTextSchema]).optional(),
		untilFrame: frameSchema('end frame').optional(),
		body: bodySchema('Write the comment.')
	})
	.strict()
	.refine((input) => input.at !== undefined || input.atFrame !== undefined, {
		message: 'Type where the comment is, e.g. 00:13:40;00 or 13:40, or press C at the playhead.',
		path: ['at']
	});
export type CommentCreate = z.infer<typeof commentCreateSchema>;

export const replySchema = z.object({ body: bodySchema('Write the reply.') }).strict();

/** Resolved, won't change (with its reason), or open again. */
export const commentAnswerSchema = z
	.object({
		state: z.enum(['open', 'resolved', 'wont_change'], {
			error: 'Pick resolved, won’t change or open.'
		}),
		reason: text('Say why.').trim().max(CUT_NOTE_MAX, 'Keep the reason shorter.').optional(),
		version: recordVersion
	})
	.strict()
	.refine((input) => input.state !== 'wont_change' || (input.reason ?? '').length > 0, {
		message: 'Say why it won’t change: the reason goes to whoever asked.',
		path: ['reason']
	});
export type CommentAnswer = z.infer<typeof commentAnswerSchema>;

/** A signed shift typed as a length (`-00:00:02;00`, `+2`, `1.5`); 0 keeps the same programme time. */
export const carryOffsetSchema = z
	.object({
		offset: text('Type the shift, e.g. +00:00:02;00 or -1.5 (seconds), or 0.')
			.trim()
			.min(1, 'Type the shift, e.g. +00:00:02;00 or -1.5 (seconds), or 0.')
			.max(40, 'That shift is far too long to be a time.'),
		version: recordVersion
	})
	.strict();

export const approvalSchema = z
	.object({
		decision: z.enum(['approved', 'changes'], { error: 'Approve it or ask for changes.' }),
		note: text('Write a note.').trim().max(CUT_NOTE_MAX, 'Keep the note shorter.').optional(),
		version: recordVersion
	})
	.strict()
	.refine((input) => input.decision !== 'changes' || (input.note ?? '').length > 0, {
		message: 'Say what should change: the editor works from this note.',
		path: ['note']
	});
export type ApprovalInput = z.infer<typeof approvalSchema>;
