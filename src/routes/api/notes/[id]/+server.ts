import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { deleteNote, updateNote } from '$lib/server/merch/notes';
import { noteUpdateSchema } from '$lib/schemas/parts';
import { deleteWithVersion } from '$lib/server/http/delete-route';
import type { RequestHandler } from './$types';

/**
 * Changes a note with the version it read (409 with `current` when stale). Camera: text, segment,
 * take, source time. Editor: program time. Merch: parts. Producer: all. A field outside the
 * caller's roles answers 403 and nothing changes.
 */
export const PATCH: RequestHandler = api(async (event) => {
	const { channel, person, roles } = requireRole(event, 'camera', 'editor', 'merch', 'producer');
	const input = await readJson(event, noteUpdateSchema);
	return json({
		note: await updateNote(
			channel.id,
			{ id: person.id, name: person.name, roles },
			event.params.id,
			input
		)
	});
});

/** The camera operator (or the producer) removes a note; `?version=` makes it conditional. */
export const DELETE: RequestHandler = deleteWithVersion(
	['camera', 'producer'],
	async (event, { channel, person, roles }, version) => ({
		removed: await deleteNote(
			channel.id,
			{ id: person.id, name: person.name, roles },
			event.params.id,
			version
		)
	})
);
