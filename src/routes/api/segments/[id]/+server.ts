import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import {
	checkSegmentChangeRoles,
	deleteSegment,
	updateSegment
} from '$lib/server/episodes/segments';
import { segmentView } from '$lib/server/episodes/rundown';
import { segmentDeleteSchema, segmentUpdateSchema } from '$lib/schemas/episodes';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event);
	return json({ segment: await segmentView(channel.id, event.params.id) });
});

/** The host or a producer changes the segment; the editor sets only its length in the cut (`recorded`). */
export const PATCH: RequestHandler = api(async (event) => {
	const { channel, roles } = requireRole(event, 'producer', 'host', 'editor');
	const input = await readJson(event, segmentUpdateSchema);
	checkSegmentChangeRoles(roles, input);
	return json({ segment: await updateSegment(channel.id, event.params.id, input) });
});

/** `{ version }`; refused once takes are logged against the segment's shots. */
export const DELETE: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event, 'producer', 'host');
	const { version } = await readJson(event, segmentDeleteSchema);
	return json({ deleted: await deleteSegment(channel.id, event.params.id, version) });
});
