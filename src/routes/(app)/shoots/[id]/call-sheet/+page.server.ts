import { forPage } from '$lib/server/http/forms';
import { requireRole } from '$lib/server/auth/guard';
import { shootDayDetail } from '$lib/server/shoot/shoot-days';
import { episodeCrewFor } from '$lib/server/shoot/call-sheet';
import { db } from '$lib/server/db';
import type { PageServerLoad } from './$types';

export const load = (async (event) => {
	const { channel } = requireRole(event);
	const [detail, settings] = await Promise.all([
		forPage(() => shootDayDetail(channel.id, event.params.id)),
		db
			.selectFrom('channel')
			.select(['name', 'contact'])
			.where('id', '=', channel.id)
			.executeTakeFirstOrThrow()
	]);
	// Nobody called for the day yet: the sheet names the episode's crew instead of a dash.
	const episodeCrew = detail.crew.length
		? []
		: await episodeCrewFor(channel.id, detail.day.episodeId);
	return { ...detail, settings, episodeCrew };
}) satisfies PageServerLoad;
