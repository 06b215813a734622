import { error } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { databaseDownError } from '$lib/server/http/outage';
import { channelSwitchNotice } from '$lib/channel-switch';
import type { LayoutServerLoad } from './$types';

export const load = (async (event) => {
	// The database did not answer when hooks.server.ts asked who is calling: 503, not "sign in".
	if (event.locals.databaseDown) error(503, databaseDownError);
	const { person, channel, roles } = requireRole(event);
	// Reading the flag here also reruns this load when a client-side link switched channel.
	const switched = channelSwitchNotice(event.url, channel);
	return { person, channel, roles, channels: event.locals.channels, switched };
}) satisfies LayoutServerLoad;
