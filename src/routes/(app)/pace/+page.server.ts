import { requireRole } from '$lib/server/auth/guard';
import { hostReadings, recordPaceReading } from '$lib/server/episodes/host-pace';
import { paceReadingSchema } from '$lib/schemas/pace';
import { runForm, text } from '$lib/server/http/forms';
import { PACE_SAMPLE, PACE_SAMPLE_WORDS } from '$lib/script/pace-sample';
import type { Actions, PageServerLoad } from './$types';

/** The Pace page: a host times themselves reading a paragraph aloud; a producer may do it for any host. */
export const load = (async (event) => {
	const { person, channel, roles } = requireRole(event, 'host', 'producer');
	return {
		hosts: await hostReadings(channel.id, { id: person.id, roles }),
		me: person.id,
		sample: PACE_SAMPLE,
		sampleWords: PACE_SAMPLE_WORDS
	};
}) satisfies PageServerLoad;

export const actions = {
	/** Stores the reading's time as the host's pace; a time that is no speaking pace is refused on its field. */
	record: async (event) => {
		const { person, channel, roles } = requireRole(event, 'host', 'producer');
		const form = await event.request.formData();
		const values = { personId: text(form, 'personId'), seconds: text(form, 'seconds') };
		const result = await runForm('record', paceReadingSchema, values, (data) =>
			recordPaceReading(channel.id, { id: person.id, roles }, data)
		);
		if (!result.ok) return result.failure;
		return {
			action: 'record' as const,
			saved: { personId: values.personId, wordsPerMinute: result.value.wordsPerMinute }
		};
	}
} satisfies Actions;
