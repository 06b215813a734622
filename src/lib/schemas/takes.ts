/** Takes logged against shots: typed source timecode, good or no good, and the clip it is in. */
import { z } from 'zod';
import { text, recordVersion, wholeNumber } from './fields';

const timecodeText = (label: string) =>
	text(`Type the source ${label} timecode.`)
		.trim()
		.min(1, `Type the source ${label} timecode.`)
		.max(20);

export const takeCreateSchema = z
	.object({
		clipName: text('Name the clip.').trim().min(1, 'Name the clip, e.g. ACAM_12004.').max(120),
		sourceIn: timecodeText('in'),
		sourceOut: timecodeText('out'),
		good: z.boolean().default(false),
		note: text().trim().max(500, 'Keep the note under 500 characters.').default(''),
		footageId: z
			.union([z.literal(''), z.string().uuid('Pick a clip from this episode’s footage.')])
			.nullable()
			.default(null)
			.transform((v) => v || null)
	})
	.strict();

export const takeUpdateSchema = z
	.object({
		good: z.boolean().optional(),
		note: text().trim().max(500, 'Keep the note under 500 characters.').optional(),
		footageId: z
			.union([z.literal(''), z.string().uuid('Pick a clip from this episode’s footage.')])
			.nullable()
			.optional()
			.transform((v) => (v === undefined ? undefined : v || null)),
		version: recordVersion
	})
	.strict();

export type TakeCreate = z.infer<typeof takeCreateSchema>;
export type TakeUpdate = z.infer<typeof takeUpdateSchema>;

/** How many takes the take picker offers at once. */
export const TAKE_PICKER_LIMIT = 20;

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** `?q=&segment=&limit=` of the take picker's search (an empty `segment` is every segment). */
export const takePickerQuerySchema = z.object({
	q: text().trim().max(120, 'Type at most 120 characters to find a take.').optional(),
	segment: z
		.string({ error: 'Pick a segment.' })
		.trim()
		.refine((value) => value === '' || UUID.test(value), 'That is not a segment of this episode.')
		.optional(),
	limit: wholeNumber({
		coerce: true,
		error: 'Ask for a number of takes, such as 20.',
		min: 1,
		max: 50,
		tooBig: 'Ask for at most 50 takes at a time.'
	}).default(TAKE_PICKER_LIMIT)
});
export type TakePickerQuery = z.infer<typeof takePickerQuerySchema>;
