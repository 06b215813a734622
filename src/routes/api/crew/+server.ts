import { json } from '@sveltejs/kit';
import { api, parseWith, readJson } from '$lib/server/http/api';
import { pageQuerySchema } from '$lib/schemas/paging';
import { requireRole } from '$lib/server/auth/guard';
import { crewPage, invitePerson } from '$lib/server/channel/crew';
import { inviteSchema } from '$lib/schemas/people';
import type { RequestHandler } from './$types';

/**
 * Any crew member may see who is on the crew (to know whom to ask); only a producer changes it.
 * By name, a page at a time: `{ items, next }`, `?after=<next>&limit=`.
 */
export const GET: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event);
	const query = parseWith(pageQuerySchema, Object.fromEntries(event.url.searchParams));
	return json(await crewPage(channel.id, query));
});

export const POST: RequestHandler = api(async (event) => {
	const { channel, person } = requireRole(event, 'producer');
	const input = await readJson(event, inviteSchema);
	return json(
		{ invited: await invitePerson(channel.id, person, input, event.url.origin) },
		{ status: 201 }
	);
});
