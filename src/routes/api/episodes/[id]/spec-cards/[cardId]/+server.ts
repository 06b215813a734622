import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { deleteSpecCard, updateSpecCard } from '$lib/server/edit/spec-cards';
import { specCardUpdateSchema } from '$lib/schemas/spec-cards';
import { deleteWithVersion } from '$lib/server/http/delete-route';
import type { RequestHandler } from './$types';

/** Changes a card's figures, segment or program time; the body names the version it read (409 when stale). */
export const PATCH: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event, 'editor', 'producer');
	const input = await readJson(event, specCardUpdateSchema);
	return json(await updateSpecCard(channel.id, event.params.id, event.params.cardId, input));
});

/** Removes a card; `?version=` makes it conditional on nobody having changed it since. */
export const DELETE: RequestHandler = deleteWithVersion(
	['editor', 'producer'],
	(event, { channel }, version) =>
		deleteSpecCard(channel.id, event.params.id, event.params.cardId, version)
);
