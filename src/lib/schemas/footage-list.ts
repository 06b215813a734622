/** The query of an episode's footage list (API and page): filters, sort and the page cursor. */
import { z } from 'zod';
import { text } from './fields';
import { pageQueryFields } from './paging';

export const FOOTAGE_SORTS = ['created', 'clip', 'camera', 'size', 'duration'] as const;
export type FootageSort = (typeof FOOTAGE_SORTS)[number];

export const footageListQuerySchema = z.object({
	shootDay: text().optional(),
	camera: text().max(40, 'A camera name has at most 40 characters.').optional(),
	purpose: z.enum(['footage', 'cut']).optional(),
	sort: z
		.enum(FOOTAGE_SORTS, { error: 'Sort by created, clip, camera, size or duration.' })
		.optional(),
	direction: z.enum(['asc', 'desc'], { error: 'Direction is asc or desc.' }).optional(),
	...pageQueryFields
});
export type FootageListQuery = z.infer<typeof footageListQuerySchema>;
