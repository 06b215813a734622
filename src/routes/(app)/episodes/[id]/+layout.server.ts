import { error } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { episodeInChannel } from '$lib/server/episodes/episodes';
import { DomainError } from '$lib/server/http/api';
import { db } from '$lib/server/db';
import type { LayoutServerLoad } from './$types';

/** The header every episode page shares: title, stage, and the tabs. 404 for another channel's episode. */
export const load = (async (event) => {
	const { channel } = requireRole(event);
	try {
		const episode = await episodeInChannel(db, channel.id, event.params.id);
		return {
			episodeHeader: {
				id: episode.id,
				title: episode.title,
				stage: episode.stage,
				slug: episode.slug
			}
		};
	} catch (failure) {
		if (failure instanceof DomainError && failure.status === 404)
			error(
				404,
				'That episode was not found in this channel. If it belongs to another channel, switch channel first.'
			);
		throw failure;
	}
}) satisfies LayoutServerLoad;
