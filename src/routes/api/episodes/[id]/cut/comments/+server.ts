import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { addComment } from '$lib/server/edit/cut-comments';
import { commentCreateSchema } from '$lib/schemas/cut-review';
import { COMMENT_ROLES } from '$lib/cut-review';
import type { RequestHandler } from './$types';

/** A comment on the current version at a frame or over a range; `@name` mails that crew member. */
export const POST: RequestHandler = api(async (event) => {
	const { channel, person } = requireRole(event, ...COMMENT_ROLES);
	const input = await readJson(event, commentCreateSchema);
	const added = await addComment(channel.id, person, event.params.id, input, event.url.origin);
	return json(added, { status: 201 });
});
