import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { answerComment } from '$lib/server/edit/cut-comments';
import { commentAnswerSchema } from '$lib/schemas/cut-review';
import type { RequestHandler } from './$types';

/** Resolved, won't change (reason required) or open again; the editor and producer answer any comment. */
export const PATCH: RequestHandler = api(async (event) => {
	const { channel, person, roles } = requireRole(event);
	const input = await readJson(event, commentAnswerSchema);
	await answerComment(
		channel.id,
		{ id: person.id, roles },
		event.params.id,
		event.params.commentId,
		input
	);
	return json({ ok: true });
});
