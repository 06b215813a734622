import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { api, parseWith } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { FOOTAGE_SORTS, listFootage } from '$lib/server/footage/footage';
import { text } from '$lib/schemas/fields';
import type { RequestHandler } from './$types';

const querySchema = z.object({
	shootDay: text().optional(),
	camera: text().max(40, 'A camera name has at most 40 characters.').optional(),
	purpose: z.enum(['footage', 'cut']).optional(),
	sort: z.enum(FOOTAGE_SORTS).optional(),
	direction: z.enum(['asc', 'desc']).optional()
});

/** Any crew member of the channel may see an episode's footage list. */
export const GET: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event);
	const query = parseWith(querySchema, Object.fromEntries(event.url.searchParams));
	return json(
		await listFootage(channel.id, event.params.id, { ...query, shootDayId: query.shootDay })
	);
});
