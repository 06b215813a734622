import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { addShot, listShots } from '$lib/server/episodes/shots';
import { shotCreateSchema } from '$lib/schemas/episodes';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event);
	return json({ shots: await listShots(channel.id, event.params.id) });
});

/** The camera operator or a producer adds a shot to the segment's shot list. */
export const POST: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event, 'producer', 'camera');
	const input = await readJson(event, shotCreateSchema);
	return json({ shot: await addShot(channel.id, event.params.id, input) }, { status: 201 });
});
