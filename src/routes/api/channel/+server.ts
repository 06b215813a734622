import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { channelSettings, updateChannelSettings } from '$lib/server/channel/channels';
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
