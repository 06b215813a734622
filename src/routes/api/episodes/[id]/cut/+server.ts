import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { setCutDuration } from '$lib/server/edit/edit';
import { cutUpdateSchema } from '$lib/schemas/edit';
import type { RequestHandler } from './$types';

/** The editor or the producer sets how long the cut runs: timecode or clock text at the episode's rate. */
export const PATCH: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event, 'editor', 'producer');
	const input = await readJson(event, cutUpdateSchema);
	return json(await setCutDuration(channel.id, event.params.id, input));
});
