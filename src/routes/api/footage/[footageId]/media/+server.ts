import { json } from '@sveltejs/kit';
import { api } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { mediaOutputsFor, retryOutputs } from '$lib/server/media/outputs';
import { footageFile } from '$lib/server/footage/footage';
import type { RequestHandler } from './$types';

/** What is made from a clip so far: `{ outputs: [{ kind, state, progress, message, details }] }`. */
export const GET: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event);
	const clip = await footageFile(channel.id, event.params.footageId);
	const outputs = await mediaOutputsFor(channel.id, [clip.id]);
	return json({ outputs: outputs[clip.id] ?? [] });
});

/** Tries the clip's failed outputs again; for those who upload footage or cuts. */
export const POST: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event, 'camera', 'editor', 'producer');
	const queued = await retryOutputs(channel.id, event.params.footageId);
	return json({ queued });
});
