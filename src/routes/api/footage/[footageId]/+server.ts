import { api } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { deleteFootage } from '$lib/server/footage/footage';
import type { RequestHandler } from './$types';

/** Only a producer deletes footage: the file and its row go together. */
export const DELETE: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event, 'producer');
	await deleteFootage(channel.id, event.params.footageId);
	return new Response(null, { status: 204 });
});
