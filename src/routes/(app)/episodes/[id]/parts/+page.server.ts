import { error } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { forPage } from '$lib/server/http/forms';
import { featuredPartsFor } from '$lib/server/merch/featured-parts';
import { clicksFor } from '$lib/server/merch/tracked-links';
import type { PageServerLoad } from './$types';

/** The featured parts list with its warnings, and the tracked links' clicks. Every crew member reads. */
export const load = (async (event) => {
	const { channel } = requireRole(event);
	const [featured, clicks] = await Promise.all([
		forPage(() => featuredPartsFor(channel.id, event.params.id)),
		clicksFor(channel.id, event.params.id, { origin: event.url.origin })
	]);
	if (!clicks) error(404, 'That episode was not found in this channel.');
	return { featured, clicks };
}) satisfies PageServerLoad;
