import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/api';
import { requireRole } from '$lib/server/guard';
import { channelSettings, updateChannelSettings } from '$lib/server/channels';
import { channelSettingsSchema } from '$lib/schemas/people';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event);
	return json({ channel: await channelSettings(channel.id) });
});

export const PATCH: RequestHandler = api(async (event) => {
	const { channel } = requireRole(event, 'producer');
	const input = await readJson(event, channelSettingsSchema);
	return json({ channel: await updateChannelSettings(channel.id, input) });
});
