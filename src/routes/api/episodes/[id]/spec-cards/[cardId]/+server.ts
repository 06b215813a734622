import { json } from '@sveltejs/kit';
import { api, parseWith, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { deleteSpecCard, updateSpecCard } from '$lib/server/edit/spec-cards';
import { specCardUpdateSchema } from '$lib/schemas/spec-cards';
import { versionNumber } from '$lib/schemas/fields';
import type { RequestHandler } from './$types';

/** Changes a card's figures, segment or program time; the body names the version it read (409 when stale). */
export const PATCH: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event, 'editor', 'producer');
	const input = await readJson(event, specCardUpdateSchema);
	return json(await updateSpecCard(channel.id, event.params.id, event.params.cardId, input));
});

const versionParam = versionNumber('version is a whole number from 1.', {
	coerce: true
}).optional();

/** Removes a card; `?version=` makes it conditional on nobody having changed it since. */
export const DELETE: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event, 'editor', 'producer');
	const version = parseWith(versionParam, event.url.searchParams.get('version') ?? undefined);
	return json(await deleteSpecCard(channel.id, event.params.id, event.params.cardId, version));
});
