import { redirect } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { createEpisode, episodeFormOptions } from '$lib/server/episodes/episodes';
import { episodeCreateSchema } from '$lib/schemas/episodes';
import { runForm } from '$lib/server/http/forms';
import { episodeFormValues } from '../episode-form';
import type { Actions, PageServerLoad } from './$types';

export const load = (async (event) => {
	const { channel } = requireRole(event, 'producer');
	return { options: await episodeFormOptions(channel.id), defaultFrameRate: channel.frameRate };
}) satisfies PageServerLoad;

export const actions = {
	create: async (event) => {
		const { channel, person, roles } = requireRole(event, 'producer');
		const values = episodeFormValues(await event.request.formData());
		const result = await runForm('create', episodeCreateSchema, values, (data) =>
			createEpisode(channel.id, { ...person, roles }, data, event.url.origin)
		);
		if (!result.ok) return result.failure;
		redirect(303, `/episodes/${result.value.id}/rundown?created=1`);
	}
} satisfies Actions;
