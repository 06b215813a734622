import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { reorderSegments } from '$lib/server/episodes/rundown-order';
import { reorderSchema } from '$lib/schemas/episodes';
import type { RequestHandler } from './$types';

/** `{ order: [segment ids] }`: every segment of the episode exactly once, or 400 and nothing changes. */
export const PUT: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event, 'producer', 'host');
	const { order } = await readJson(event, reorderSchema);
	return json(await reorderSegments(channel.id, event.params.id, order));
});
