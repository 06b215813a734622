import { requireRole } from '$lib/server/auth/guard';
import { storageView } from '$lib/server/footage/storage';
import { maxUploadBytes } from '$lib/server/footage/tus-server';
import { storageQuerySchema } from '$lib/schemas/storage';
import type { PageServerLoad } from './$types';

/** Any crew member may read it; the producer acts on it (quota under Channel, footage per episode). */
export const load = (async (event) => {
	const { channel } = requireRole(event);
	const parsed = storageQuerySchema.safeParse({
		after: event.url.searchParams.get('after') ?? undefined
	});
	// A broken "more" link shows the first page with a note, never an error page.
	const after = parsed.success ? parsed.data.after : undefined;
	const { channel: storage, ...page } = await storageView(channel.id, maxUploadBytes(), { after });
	return {
		storage,
		page,
		later: Boolean(after),
		linkProblem: parsed.success ? null : (parsed.error.issues[0]?.message ?? null)
	};
}) satisfies PageServerLoad;
