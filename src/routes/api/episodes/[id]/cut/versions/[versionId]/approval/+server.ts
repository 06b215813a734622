import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { answerVersion } from '$lib/server/edit/cut-versions';
import { approvalSchema } from '$lib/schemas/cut-review';
import { APPROVE_ROLES } from '$lib/cut-review';
import type { RequestHandler } from './$types';

/** The producer approves the current version or asks for changes with a note. */
export const POST: RequestHandler = api(async (event) => {
	const { channel, person } = requireRole(event, ...APPROVE_ROLES);
	const input = await readJson(event, approvalSchema);
	await answerVersion(channel.id, person.id, event.params.id, event.params.versionId, input);
	return json({ ok: true });
});
