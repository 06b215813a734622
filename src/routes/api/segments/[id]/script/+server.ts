import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { saveScript } from '$lib/server/episodes/script-saves';
import { segmentView } from '$lib/server/episodes/rundown';
import { scriptSaveSchema } from '$lib/schemas/episodes';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event);
	const segment = await segmentView(channel.id, event.params.id);
	return json({
		script: {
			segmentId: segment.id,
			...segment.script,
			words: segment.words,
			spokenSeconds: segment.spokenSeconds
		}
	});
});

/** `{ body, version }`: a stale version answers 409 with the saved text in `current`, nothing overwritten. */
export const PUT: RequestHandler = api(async (event) => {
	const { channel, person, roles } = requireRole(event, 'producer', 'host');
	const input = await readJson(event, scriptSaveSchema);
	return json({
		script: await saveScript(channel.id, { ...person, roles }, event.params.id, input)
	});
});
