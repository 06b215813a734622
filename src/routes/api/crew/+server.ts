import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { invitePerson, listCrew } from '$lib/server/channel/crew';
import { inviteSchema } from '$lib/schemas/people';
import type { RequestHandler } from './$types';

/** Any crew member may see who is on the crew (to know whom to ask); only a producer changes it. */
export const GET: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event);
	return json({ crew: await listCrew(channel.id) });
});

export const POST: RequestHandler = api(async (event) => {
	const { channel, person } = requireRole(event, 'producer');
	const input = await readJson(event, inviteSchema);
	return json(
		{ invited: await invitePerson(channel.id, person, input, event.url.origin) },
		{ status: 201 }
	);
});
