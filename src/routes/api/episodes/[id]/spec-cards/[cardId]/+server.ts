import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { api, parseWith, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { deleteSpecCard, updateSpecCard } from '$lib/server/edit/spec-cards';
import { specCardUpdateSchema } from '$lib/schemas/spec-cards';
import type { RequestHandler } from './$types';

/** Changes a card's figures, segment or program time; the body names the version it read (409 when stale). */
export const PATCH: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event, 'editor', 'producer');
	const input = await readJson(event, specCardUpdateSchema);
	return json(await updateSpecCard(channel.id, event.params.id, event.params.cardId, input));
});

const versionParam = z.coerce
	.number({ error: 'version is a whole number.' })
	.int('version is a whole number.')
	.min(1, 'version is 1 or more.')
	.optional();

/** Removes a card; `?version=` makes it conditional on nobody having changed it since. */
export const DELETE: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event, 'editor', 'producer');
	const version = parseWith(versionParam, event.url.searchParams.get('version') ?? undefined);
	return json(await deleteSpecCard(channel.id, event.params.id, event.params.cardId, version));
});
