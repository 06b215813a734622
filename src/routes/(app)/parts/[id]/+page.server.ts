import { redirect } from '@sveltejs/kit';
import { hasRole, requireRole } from '$lib/server/auth/guard';
import { forPage, runForm, text } from '$lib/server/http/forms';
import { partDetail, priceText, removePart, updatePart } from '$lib/server/merch/parts';
import { partUpdateSchema } from '$lib/schemas/parts';
import { partFormValues } from '../part-form';
import { versionOnlySchema } from '$lib/schemas/fields';
import type { Actions, PageServerLoad } from './$types';

/** One part: everyone reads; the merch team and the producer change, retire or remove it. */
export const load = (async (event) => {
	const { channel } = requireRole(event);
	const part = await forPage(() => partDetail(channel.id, event.params.id));
	return {
		part,
		price: priceText(part.priceCents),
		canEdit: hasRole(event.locals, 'merch', 'producer')
	};
}) satisfies PageServerLoad;

export const actions = {
	save: async (event) => {
		const { channel } = requireRole(event, 'merch', 'producer');
		const form = await event.request.formData();
		const values = { ...partFormValues(form), version: text(form, 'version') };
		const result = await runForm('save', partUpdateSchema, values, (data) =>
			updatePart(channel.id, event.params.id, data)
		);
		if (!result.ok) return result.failure;
		return { action: 'save', saved: true };
	},
	retire: async (event) => {
		const { channel } = requireRole(event, 'merch', 'producer');
		const values = { version: text(await event.request.formData(), 'version') };
		const result = await runForm('retire', versionOnlySchema, values, ({ version }) =>
			updatePart(channel.id, event.params.id, { version, status: 'discontinued' })
		);
		if (!result.ok) return result.failure;
		return { action: 'retire', saved: true };
	},
	remove: async (event) => {
		const { channel } = requireRole(event, 'merch', 'producer');
		const values = { version: text(await event.request.formData(), 'version') };
		const result = await runForm('remove', versionOnlySchema, values, ({ version }) =>
			removePart(channel.id, event.params.id, version)
		);
		if (!result.ok) return result.failure;
		redirect(303, '/parts');
	}
} satisfies Actions;
