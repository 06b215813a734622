import { error, json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { createToken, listTokens } from '$lib/server/auth/tokens';
import { tokenCreateSchema } from '$lib/schemas/people';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = api(async (event) => {
	const { person, channel } = requireRole(event);
	return json({ tokens: await listTokens(channel.id, person.id) });
});

/**
 * The token's secret is in this answer and nowhere else, ever. Only a signed-in person makes tokens:
 * a token that could make more would outlive its own revocation.
 */
export const POST: RequestHandler = api(async (event) => {
	const { person, channel } = requireRole(event);
	if (event.locals.via === 'token')
		error(403, 'Make new tokens while signed in, under Account; an API token cannot make another.');
	const { label } = await readJson(event, tokenCreateSchema);
	return json({ token: await createToken(channel.id, person.id, label) }, { status: 201 });
});
