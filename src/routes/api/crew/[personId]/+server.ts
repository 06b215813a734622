import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { updateMember } from '$lib/server/channel/crew';
import { crewUpdateSchema } from '$lib/schemas/people';
import type { RequestHandler } from './$types';

export const PATCH: RequestHandler = api(async (event) => {
	const { channel, person } = requireRole(event, 'producer');
	const change = await readJson(event, crewUpdateSchema);
	return json({ member: await updateMember(channel.id, person.id, event.params.personId, change) });
});
