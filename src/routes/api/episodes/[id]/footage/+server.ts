import { json } from '@sveltejs/kit';
import { api, parseWith } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { listFootage } from '$lib/server/footage/footage';
import { footageListQuerySchema } from '$lib/schemas/footage-list';
import type { RequestHandler } from './$types';

/**
 * Any crew member of the channel may see an episode's footage list, a page at a time:
 * `{ episode, totals, sort, direction, footage, next }`; `?after=<next>&limit=` asks for the
 * following page (filters and sort as on the first: `shootDay`, `camera`, `purpose`, `sort`,
 * `direction`).
 */
export const GET: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event);
	const query = parseWith(footageListQuerySchema, Object.fromEntries(event.url.searchParams));
	return json(
		await listFootage(channel.id, event.params.id, { ...query, shootDayId: query.shootDay })
	);
});
