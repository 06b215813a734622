import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { reviewScript, reviewsFor, scriptStateFor } from '$lib/server/episodes/script-reviews';
import { scriptReviewSchema } from '$lib/schemas/episodes';
import type { RequestHandler } from './$types';

/** The script's approval state (with the fingerprint to approve against) and its review trail. */
export const GET: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event);
	const [state, reviews] = await Promise.all([
		scriptStateFor(channel.id, event.params.id),
		reviewsFor(channel.id, event.params.id)
	]);
	return json({ ...state, reviews });
});

/** `{ action: submit | approve | return | comment, body, fingerprint?, segmentId? }`. */
export const POST: RequestHandler = api(async (event) => {
	const { channel, person, roles } = requireRole(event, 'producer', 'host');
	const input = await readJson(event, scriptReviewSchema);
	return json(
		await reviewScript(channel.id, { ...person, roles }, event.params.id, input, event.url.origin)
	);
});
