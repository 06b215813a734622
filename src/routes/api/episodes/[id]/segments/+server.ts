import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { createSegment } from '$lib/server/episodes/segments';
import { rundownFor } from '$lib/server/episodes/rundown';
import { segmentCreateSchema } from '$lib/schemas/episodes';
import type { RequestHandler } from './$types';

/** The rundown: segments in order with scripts, timings at the host's pace, cautions and shots. */
export const GET: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event);
	return json(await rundownFor(channel.id, event.params.id));
});

/** The host or a producer adds a segment at the end of the rundown. */
export const POST: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event, 'producer', 'host');
	const input = await readJson(event, segmentCreateSchema);
	return json(
		{ segment: await createSegment(channel.id, event.params.id, input) },
		{ status: 201 }
	);
});
