import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { updateCaution } from '$lib/server/episodes/cautions';
import { cautionUpdateSchema } from '$lib/schemas/episodes';
import type { RequestHandler } from './$types';

/**
 * `{ text?, at?, atFrame?, version }`: the host or a producer words the caution; the editor or a
 * producer places it (`at` is timecode or clock text at the episode's rate; '' or null un-places it).
 */
export const PATCH: RequestHandler = api(async (event) => {
	const { channel, person, roles } = requireRole(event, 'producer', 'host', 'editor');
	const input = await readJson(event, cautionUpdateSchema);
	return json({
		caution: await updateCaution(
			channel.id,
			{ ...person, roles },
			event.params.id,
			event.params.hazard,
			input
		)
	});
});
