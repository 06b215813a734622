import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { replyToComment } from '$lib/server/edit/cut-comments';
import { replySchema } from '$lib/schemas/cut-review';
import type { RequestHandler } from './$types';

/** A reply under a comment; any crew member of the channel. */
export const POST: RequestHandler = api(async (event) => {
	const { channel, person } = requireRole(event);
	const { body } = await readJson(event, replySchema);
	const added = await replyToComment(
		channel.id,
		person,
		event.params.id,
		event.params.commentId,
		body,
		event.url.origin
	);
	return json(added, { status: 201 });
});
