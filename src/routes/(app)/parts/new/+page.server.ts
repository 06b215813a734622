import { redirect } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { runForm } from '$lib/server/http/forms';
import { createPart } from '$lib/server/merch/parts';
import { partCreateSchema } from '$lib/schemas/parts';
import { partFormValues } from '../part-form';
import type { Actions, PageServerLoad } from './$types';

/** A new catalogue part: the merch team and the producer only. */
export const load = (async (event) => {
	requireRole(event, 'merch', 'producer');
	return {};
}) satisfies PageServerLoad;

export const actions = {
	default: async (event) => {
		const { channel } = requireRole(event, 'merch', 'producer');
		const values = partFormValues(await event.request.formData());
		const result = await runForm('create', partCreateSchema, values, (data) =>
			createPart(channel.id, data)
		);
		if (!result.ok) return result.failure;
		redirect(303, `/parts/${result.value.id}`);
	}
} satisfies Actions;
