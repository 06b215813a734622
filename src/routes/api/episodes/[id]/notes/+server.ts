import { json } from '@sveltejs/kit';
import { api, parseWith, readJson } from '$lib/server/http/api';
import { pageQuerySchema } from '$lib/schemas/paging';
import { requireRole } from '$lib/server/auth/guard';
import { createNote } from '$lib/server/merch/notes';
import { notesPageFor } from '$lib/server/merch/notes-page';
import { noteCreateSchema } from '$lib/schemas/parts';
import type { RequestHandler } from './$types';

/**
 * Any crew member reads an episode's segment notes, with the segments to pick from (takes come from
 * ../takes/picker as the person types), a page of notes at a time: `notes` and `next`;
 * `?after=<next>&limit=` asks for the following page.
 */
export const GET: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event);
	const query = parseWith(pageQuerySchema, Object.fromEntries(event.url.searchParams));
	return json(await notesPageFor(channel.id, event.params.id, query));
});

/**
 * The camera operator, the merch team or the producer starts a note; the take and source time need
 * the camera operator, the program time the editor, the parts the merch team.
 */
export const POST: RequestHandler = api(async (event) => {
	const { channel, person, roles } = requireRole(event, 'camera', 'merch', 'producer');
	const input = await readJson(event, noteCreateSchema);
	return json(
		{
			note: await createNote(
				channel.id,
				{ id: person.id, name: person.name, roles },
				event.params.id,
				input
			)
		},
		{ status: 201 }
	);
});
