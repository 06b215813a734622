import { json } from '@sveltejs/kit';
import { api, parseWith, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { carryPreview, confirmCarryOffset } from '$lib/server/edit/cut-versions';
import { carryOffsetSchema } from '$lib/schemas/cut-review';
import { VERSION_ROLES } from '$lib/cut-review';
import type { RequestHandler } from './$types';

const previewSchema = carryOffsetSchema.pick({ offset: true });

/** What `?offset=` would do to the comments carried into this version; nothing is written. */
export const GET: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event, ...VERSION_ROLES);
	const { offset } = parseWith(previewSchema, {
		offset: event.url.searchParams.get('offset') ?? ''
	});
	return json(await carryPreview(channel.id, event.params.id, event.params.versionId, offset));
});

/** The editor confirms the offset: the carried comments move by it from where they were. */
export const POST: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event, ...VERSION_ROLES);
	const input = await readJson(event, carryOffsetSchema);
	return json(await confirmCarryOffset(channel.id, event.params.id, event.params.versionId, input));
});
