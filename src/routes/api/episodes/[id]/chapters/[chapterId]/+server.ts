import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { deleteChapter, updateChapter } from '$lib/server/edit/edit';
import { chapterUpdateSchema } from '$lib/schemas/edit';
import { deleteWithVersion } from '$lib/server/http/delete-route';
import type { RequestHandler } from './$types';

/** Moves, renames or relinks a chapter; the body names the version it read (409 when stale). */
export const PATCH: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event, 'editor', 'producer');
	const input = await readJson(event, chapterUpdateSchema);
	return json(await updateChapter(channel.id, event.params.id, event.params.chapterId, input));
});

/** Removes a chapter; `?version=` makes it conditional on nobody having changed it since. */
export const DELETE: RequestHandler = deleteWithVersion(
	['editor', 'producer'],
	(event, { channel }, version) =>
		deleteChapter(channel.id, event.params.id, event.params.chapterId, version)
);
