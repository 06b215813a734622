import { fail, redirect } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { channelSettings, updateChannelSettings } from '$lib/server/channel/channels';
import { channelSettingsSchema } from '$lib/schemas/people';
import { runForm } from '$lib/server/http/forms';
import { chooseChannel } from '$lib/server/channel/current-channel';
import { storageInUse } from '$lib/server/footage/upload-limits';
import { maxUploadBytes } from '$lib/server/footage/tus-server';
import { safeRedirectPath } from '$lib/safe-redirect';
import type { Actions, PageServerLoad } from './$types';

export const load = (async (event) => {
	const { channel } = requireRole(event, 'producer');
	const [settings, storage] = await Promise.all([
		channelSettings(channel.id),
		storageInUse(channel.id, maxUploadBytes())
	]);
	return { settings, storageUsedBytes: storage.usedBytes };
}) satisfies PageServerLoad;

export const actions = {
	save: async (event) => {
		const { channel } = requireRole(event, 'producer');
		const form = await event.request.formData();
		const values = Object.fromEntries(
			['name', 'frameRate', 'callToAction', 'contact', 'descriptionLimit', 'version'].map((key) => [
				key,
				String(form.get(key) ?? '')
			])
		);
		// A form without the quota or disclosure field (an older page) keeps the channel's value.
		if (form.has('storageQuotaGb')) values.storageQuotaGb = String(form.get('storageQuotaGb'));
		if (form.has('disclosure')) values.disclosure = String(form.get('disclosure'));
		const result = await runForm('save', channelSettingsSchema, values, (data) =>
			updateChannelSettings(channel.id, data)
		);
		if (!result.ok) return result.failure;
		return { action: 'save', saved: true };
	},
	/** Any crew member may switch to another channel they belong to. */
	switch: async (event) => {
		const { person } = requireRole(event);
		const form = await event.request.formData();
		const wanted = String(form.get('channelId') ?? '');
		if (!event.locals.channels.some((c) => c.id === wanted))
			return fail(404, { errors: { channelId: ['You are not on that channel’s crew.'] } });
		await chooseChannel(event, person.id, wanted);
		redirect(303, sectionOf(safeRedirectPath(form.get('next'))));
	}
} satisfies Actions;

/** The section a page belongs to ("/parts/…" → "/parts"): a record of the old channel is not found in the new one. */
const sectionOf = (path: string) => '/' + (path.split(/[/?#]/)[1] ?? '');
