/** What the Pace page sends: whose reading it was and how long it took. Shared by the form and its tests. */
import { z } from 'zod';

/** Our own bounds on a typed reading time: a click, or a stopwatch left running, is not a reading. */
export const PACE_READING_SECONDS = { min: 1, max: 600 } as const;

export const paceReadingSchema = z.object({
	personId: z.uuid({ error: 'Pick the host who read the paragraph.' }),
	seconds: z.preprocess(
		(value) =>
			typeof value === 'string' && value.trim() !== '' ? Number(value.trim()) : undefined,
		z
			.number({ error: 'Enter how long the reading took, in seconds (for example 41.5).' })
			.min(
				PACE_READING_SECONDS.min,
				'That is under a second: time the whole paragraph, from the first word to the last.'
			)
			.max(
				PACE_READING_SECONDS.max,
				'That is over ten minutes: stop the clock after the last word and time it again.'
			)
	)
});

export type PaceReadingInput = z.infer<typeof paceReadingSchema>;
