import { forPage } from '$lib/server/http/forms';
import { requireRole } from '$lib/server/auth/guard';
import { shootDayDetail } from '$lib/server/shoot/shoot-days';
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
	return { ...detail, settings };
}) satisfies PageServerLoad;
