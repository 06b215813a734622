import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { setChangeNote } from '$lib/server/edit/cut-versions';
import { versionNoteSchema } from '$lib/schemas/cut-review';
import { VERSION_ROLES } from '$lib/cut-review';
import type { RequestHandler } from './$types';

/** The editor rewrites a version's change note; the body names the version it read (409 when stale). */
export const PATCH: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event, ...VERSION_ROLES);
	const input = await readJson(event, versionNoteSchema);
	await setChangeNote(channel.id, event.params.id, event.params.versionId, input);
	return json({ ok: true });
});
