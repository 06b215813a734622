import { fail, redirect } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { attempt, parseForm } from '$lib/server/http/forms';
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
		const parsed = parseForm(partCreateSchema, values);
		if (!parsed.ok) return fail(400, { errors: parsed.errors, values });
		const result = await attempt(values, async () => ({
			part: await createPart(channel.id, parsed.data)
		}));
		if (!('part' in result)) return result;
		redirect(303, `/parts/${result.part.id}`);
	}
} satisfies Actions;
