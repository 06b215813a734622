import { requireRole, hasRole } from '$lib/server/auth/guard';
import { deleteFootage, listFootage } from '$lib/server/footage/footage';
import { shootDayOptions } from '$lib/server/shoot/shoot-days';
import { attempt, forPage } from '$lib/server/http/forms';
import { assertInEpisode } from '$lib/server/http/ownership';
import { UPLOAD_ROLES } from '$lib/server/footage/tus-server';
import { mediaOutputsFor } from '$lib/server/media/outputs';
import { fieldIssues } from '$lib/server/http/api';
import { footageListQuerySchema } from '$lib/schemas/footage-list';
import type { Actions, PageServerLoad } from './$types';

/**
 * One page of the episode's footage: filters and sort come from the query string (a plain GET form
 * and header links drive them), "More footage" links to the page after the last row shown.
 */
export const load = (async (event) => {
	const { channel } = requireRole(event);
	const raw = Object.fromEntries([...event.url.searchParams].filter(([, value]) => value !== ''));
	const parsed = footageListQuerySchema.safeParse(raw);
	const query = parsed.success ? parsed.data : footageListQuerySchema.parse({});
	const [{ episode, footage, totals, sort, direction, next }, shootDays] = await Promise.all([
		forPage(() =>
			listFootage(channel.id, event.params.id, { ...query, shootDayId: query.shootDay })
		),
		shootDayOptions(channel.id, event.params.id)
	]);
	return {
		episode,
		footage,
		totals,
		next,
		list: {
			sort,
			direction,
			shootDay: query.shootDay ?? '',
			camera: query.camera ?? '',
			after: Boolean(query.after)
		},
		listErrors: parsed.success ? null : fieldIssues(parsed.error),
		media: await mediaOutputsFor(
			channel.id,
			footage.map((clip) => clip.id)
		),
		shootDays,
		purposes: (['footage', 'cut'] as const).filter((purpose) =>
			hasRole(event.locals, ...UPLOAD_ROLES[purpose])
		),
		canDelete: hasRole(event.locals, 'producer')
	};
}) satisfies PageServerLoad;

export const actions = {
	delete: async (event) => {
		const { channel } = requireRole(event, 'producer');
		const form = await event.request.formData();
		const id = String(form.get('id') ?? '');
		const result = await attempt('delete', { id }, async () => {
			await assertInEpisode(channel.id, event.params.id, 'footage', id);
			return deleteFootage(channel.id, id);
		});
		if (!result.ok) return result.failure;
		return { action: 'delete', deleted: id };
	}
} satisfies Actions;
