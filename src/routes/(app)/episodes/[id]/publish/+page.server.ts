import { requireRole } from '$lib/server/auth/guard';
import { forPage } from '$lib/server/http/forms';
import { publishKitFor } from '$lib/server/merch/publish-kit';
import type { PageServerLoad } from './$types';

/** The publish kit: every crew member reads and copies it (the text is assembled, never stored). */
export const load = (async (event) => {
	const { channel } = requireRole(event);
	return {
		kit: await forPage(() =>
			publishKitFor(channel.id, event.params.id, { origin: event.url.origin })
		)
	};
}) satisfies PageServerLoad;
