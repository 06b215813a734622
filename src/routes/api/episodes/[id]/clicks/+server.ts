import { json } from '@sveltejs/kit';
import { api, notFound, parseWith } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { isUuid } from '$lib/server/auth/identity';
import { CLICK_DAYS, clicksFor } from '$lib/server/merch/tracked-links';
import { wholeNumber } from '$lib/schemas/fields';
import type { RequestHandler } from './$types';

const daysParam = wholeNumber({
	error: 'days is a whole number.',
	coerce: true,
	min: 1,
	max: 366,
	tooSmall: 'days is 1 or more.',
	tooBig: 'days is at most 366.'
}).default(CLICK_DAYS);

/** Any crew member reads the tracked links' clicks per day (UTC) for the last `?days=` days (30). */
export const GET: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event);
	const days = parseWith(daysParam, event.url.searchParams.get('days') ?? undefined);
	const clicks = isUuid(event.params.id)
		? await clicksFor(channel.id, event.params.id, { origin: event.url.origin, days })
		: null;
	if (!clicks) throw notFound('That episode');
	return json(clicks);
});
