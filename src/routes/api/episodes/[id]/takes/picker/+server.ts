import { json } from '@sveltejs/kit';
import { api, parseWith } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { pickTakes } from '$lib/server/shoot/take-picker';
import { takePickerQuerySchema } from '$lib/schemas/takes';
import type { RequestHandler } from './$types';

/**
 * The take picker asks as the person types: `?q=<words of a clip name or shot>&segment=<id>&limit=`,
 * takes of this episode only, `{ items: [{ id, clipName, segmentId, shot, good, sourceIn, sourceOut }] }`.
 * Every crew member may search (any of them can read the episode's shot list and notes).
 */
export const GET: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event);
	const query = parseWith(takePickerQuerySchema, Object.fromEntries(event.url.searchParams));
	return json(
		{ items: await pickTakes(channel.id, event.params.id, query) },
		{ headers: { 'cache-control': 'private, no-store' } }
	);
});
