import { requireRole, hasRole } from '$lib/server/auth/guard';
import { deleteFootage, listFootage } from '$lib/server/footage/footage';
import { shootDayOptions } from '$lib/server/shoot/shoot-days';
import { attempt, forPage } from '$lib/server/http/forms';
import { assertInEpisode } from '$lib/server/http/ownership';
import { UPLOAD_ROLES } from '$lib/server/footage/tus-server';
import { mediaOutputsFor } from '$lib/server/media/outputs';
import type { Actions, PageServerLoad } from './$types';

export const load = (async (event) => {
	const { channel } = requireRole(event);
	const [{ episode, footage }, shootDays] = await Promise.all([
		forPage(() => listFootage(channel.id, event.params.id)),
		shootDayOptions(channel.id, event.params.id)
	]);
	return {
		episode,
		footage,
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
