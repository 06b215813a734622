import { fail, redirect } from '@sveltejs/kit';
import { hasRole, requireRole } from '$lib/server/auth/guard';
import { attempt, forPage, parseForm, readVersion } from '$lib/server/http/forms';
import { partDetail, priceText, removePart, updatePart } from '$lib/server/merch/parts';
import { partUpdateSchema } from '$lib/schemas/parts';
import { partFormValues } from '../part-form';
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

const versionOf = (form: FormData) => Number(form.get('version') ?? Number.NaN);

export const actions = {
	save: async (event) => {
		const { channel } = requireRole(event, 'merch', 'producer');
		const form = await event.request.formData();
		const values = { ...partFormValues(form), version: versionOf(form) };
		const parsed = parseForm(partUpdateSchema, values);
		if (!parsed.ok) return fail(400, { action: 'save', errors: parsed.errors, values });
		const result = await attempt(values, async () => ({
			part: await updatePart(channel.id, event.params.id, parsed.data)
		}));
		if (!('part' in result)) return fail(result.status, { action: 'save', ...result.data });
		return { action: 'save', saved: true };
	},
	retire: async (event) => {
		const { channel } = requireRole(event, 'merch', 'producer');
		const read = readVersion(await event.request.formData());
		if (!read.ok) return fail(400, { action: 'retire', errors: read.errors, values: {} });
		const values = { version: read.version, status: 'discontinued' as const };
		const result = await attempt(values, async () => ({
			part: await updatePart(channel.id, event.params.id, values)
		}));
		if (!('part' in result)) return fail(result.status, { action: 'retire', ...result.data });
		return { action: 'retire', saved: true };
	},
	remove: async (event) => {
		const { channel } = requireRole(event, 'merch', 'producer');
		const read = readVersion(await event.request.formData());
		if (!read.ok) return fail(400, { action: 'remove', errors: read.errors, values: {} });
		const values = { version: read.version };
		const result = await attempt(values, async () => ({
			part: await removePart(channel.id, event.params.id, values.version)
		}));
		if (!('part' in result)) return fail(result.status, { action: 'remove', ...result.data });
		redirect(303, '/parts');
	}
} satisfies Actions;
