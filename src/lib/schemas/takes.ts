/** Takes logged against shots: typed source timecode, good or no good, and the clip it is in. */
import { z } from 'zod';
import { text, recordVersion } from './fields';

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
