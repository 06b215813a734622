import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { partDetail, removePart, updatePart } from '$lib/server/merch/parts';
import { partUpdateSchema } from '$lib/schemas/parts';
import { deleteWithVersion } from '$lib/server/http/delete-route';
import type { RequestHandler } from './$types';

/** Any crew member reads a part, with how many notes and tracked links feature it. */
export const GET: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event);
	return json({ part: await partDetail(channel.id, event.params.id) });
});

/** The merch team (or the producer) changes a part; the body names the version it read (409 when stale). Retire = status "discontinued". */
export const PATCH: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event, 'merch', 'producer');
	const input = await readJson(event, partUpdateSchema);
	return json({ part: await updatePart(channel.id, event.params.id, input) });
});

/** Removes a part no note or tracked link uses; a featured one answers 409 (retire it instead). */
export const DELETE: RequestHandler = deleteWithVersion(
	['merch', 'producer'],
	async (event, { channel }, version) => ({
		removed: await removePart(channel.id, event.params.id, version)
	})
);
