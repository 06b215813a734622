import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { setSegmentSpan } from '$lib/server/edit/segment-spans';
import { segmentSpanSchema } from '$lib/schemas/edit';
import type { RequestHandler } from './$types';

/**
 * `{ in, out, version }`: the editor or a producer places the segment on the edit timeline (timecode
 * or clock text at the episode's rate, out exclusive; both '' or null take it off).
 */
export const PATCH: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event, 'editor', 'producer');
	const input = await readJson(event, segmentSpanSchema);
	return json({ span: await setSegmentSpan(channel.id, event.params.id, input) });
});
