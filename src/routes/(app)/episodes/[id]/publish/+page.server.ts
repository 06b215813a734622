import { requireRole } from '$lib/server/guard';
import { forPage } from '$lib/server/forms';
import { publishKitFor } from '$lib/server/publish-kit';
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
