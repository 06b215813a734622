/**
 * The assigned host's speaking pace, which turns a script's words into spoken time on the rundown,
 * the script pages and the script preview; and the timed readings it comes from (the Pace page).
 *
 * The pace is measured from speech: the host reads a fixed paragraph aloud ($lib/script/pace-sample)
 * and times it. A segment's length in the cut is not a speaking pace (how-to segments are mostly
 * wordless work), so it is never used.
 */
import { error } from '@sveltejs/kit';
import { db } from '../db';
import type { Executor } from './episodes';
import { DomainError, notFound } from '../http/api';
import { CALIBRATED_PACE_RANGE, calibratePace, type CalibratedPace } from '$lib/script/timing';
import { PACE_SAMPLE_WORDS } from '$lib/script/pace-sample';
import type { PaceReadingInput } from '$lib/schemas/pace';
import type { Role } from '$lib/roles';

export interface HostPace extends CalibratedPace {
	hostName: string | null;
	/** What the pace is based on: the host's timed reading, or the default (no host, or no reading). */
	basis: 'reading' | 'default';
	/** When the reading was timed (ISO), for 'reading'. */
	measuredAt: string | null;
}

/** A stored reading as a pace (calibratePace re-checks the range, so a bad row can never be used). */
function paceOfReading(reading: { words: number; milliseconds: number } | undefined) {
	if (!reading) return calibratePace([]);
	return calibratePace([{ words: reading.words, recordedSeconds: reading.milliseconds / 1000 }]);
}

/** The assigned host's pace from their timed reading in this channel, else the 150 wpm default. */
export async function hostPaceFor(
	channelId: string,
	episodeId: string,
	executor: Executor = db
): Promise<HostPace> {
	const host = await executor
		.selectFrom('episodeAssignment')
		.innerJoin('episode', 'episode.id', 'episodeAssignment.episodeId')
		.innerJoin('person', 'person.id', 'episodeAssignment.personId')
		.leftJoin('speakingPace', (join) =>
			join
				.onRef('speakingPace.personId', '=', 'person.id')
				.onRef('speakingPace.channelId', '=', 'episode.channelId')
		)
		.select([
			'person.name',
			'speakingPace.words',
			'speakingPace.milliseconds',
			'speakingPace.recordedAt'
		])
		.where('episodeAssignment.episodeId', '=', episodeId)
		.where('episode.channelId', '=', channelId)
		.where('episodeAssignment.role', '=', 'host')
		.executeTakeFirst();
	const reading =
		host?.words != null && host.milliseconds != null
			? { words: host.words, milliseconds: host.milliseconds }
			: undefined;
	const pace = paceOfReading(reading);
	return {
		...pace,
		hostName: host?.name ?? null,
		basis: pace.calibrated ? 'reading' : 'default',
		measuredAt: pace.calibrated && host?.recordedAt ? new Date(host.recordedAt).toISOString() : null
	};
}

export interface HostReading {
	personId: string;
	name: string;
	wordsPerMinute: number | null;
	measuredAt: string | null;
	recordedByName: string | null;
}

/**
 * The channel's hosts (active members with the host role) and their readings, for the Pace page. A
 * producer sees every host; anyone else only themselves.
 */
export async function hostReadings(
	channelId: string,
	caller: { id: string; roles: readonly Role[] }
): Promise<HostReading[]> {
	let query = db
		.selectFrom('membership')
		.innerJoin('person', 'person.id', 'membership.personId')
		.leftJoin('speakingPace', (join) =>
			join
				.onRef('speakingPace.personId', '=', 'membership.personId')
				.onRef('speakingPace.channelId', '=', 'membership.channelId')
		)
		.leftJoin('person as recorder', 'recorder.id', 'speakingPace.recordedBy')
		.select([
			'person.id',
			'person.name',
			'speakingPace.words',
			'speakingPace.milliseconds',
			'speakingPace.recordedAt',
			'recorder.name as recordedByName'
		])
		.where('membership.channelId', '=', channelId)
		.where('membership.disabledAt', 'is', null)
		.where((eb) => eb(eb.val('host'), '=', eb.fn.any('membership.roles')))
		.orderBy('person.name');
	if (!caller.roles.includes('producer')) query = query.where('person.id', '=', caller.id);
	const rows = await query.execute();
	return rows.map((row) => {
		const pace = paceOfReading(
			row.words != null && row.milliseconds != null
				? { words: row.words, milliseconds: row.milliseconds }
				: undefined
		);
		return {
			personId: row.id,
			name: row.name,
			wordsPerMinute: pace.calibrated ? pace.wordsPerMinute : null,
			measuredAt: pace.calibrated && row.recordedAt ? new Date(row.recordedAt).toISOString() : null,
			recordedByName: pace.calibrated ? row.recordedByName : null
		};
	});
}

const perMinute = (value: number) => Math.round(value);

/**
 * Stores a timed reading of the sample paragraph as a host's pace in this channel. A host records
 * their own; a producer may record any of the channel's hosts. A time that makes no speaking pace
 * (outside 80–260 wpm) is refused on the `seconds` field, and the reading already stored stays.
 */
export async function recordPaceReading(
	channelId: string,
	caller: { id: string; roles: readonly Role[] },
	input: PaceReadingInput
): Promise<{ wordsPerMinute: number }> {
	const isProducer = caller.roles.includes('producer');
	if (input.personId !== caller.id && !isProducer) {
		error(403, 'Only a producer may time a reading for another host. Time your own here.');
	}
	const target = await db
		.selectFrom('membership')
		.select('membership.personId')
		.where('membership.channelId', '=', channelId)
		.where('membership.personId', '=', input.personId)
		.where('membership.disabledAt', 'is', null)
		.where((eb) => eb(eb.val('host'), '=', eb.fn.any('membership.roles')))
		.executeTakeFirst();
	if (!target) {
		throw notFound('That host', 'Pick one of the hosts of this channel.');
	}
	const milliseconds = Math.round(input.seconds * 1000);
	const pace = calibratePace([{ words: PACE_SAMPLE_WORDS, recordedSeconds: milliseconds / 1000 }]);
	if (!pace.calibrated) {
		const measured = pace.measuredWordsPerMinute;
		const message =
			measured === null
				? 'That reading is too short to measure: read the whole paragraph, then stop the clock.'
				: `${input.seconds} s for ${PACE_SAMPLE_WORDS} words is ${perMinute(measured)} words a minute: not a speaking pace (we take ${CALIBRATED_PACE_RANGE.minimum}–${CALIBRATED_PACE_RANGE.maximum}). ${
						measured > CALIBRATED_PACE_RANGE.maximum
							? 'Was the clock stopped early? '
							: 'Was the clock left running? '
					}Start it on the first word, stop it after the last, and time it again.`;
		throw new DomainError(400, message, { seconds: [message] });
	}
	await db
		.insertInto('speakingPace')
		.values({
			channelId,
			personId: input.personId,
			words: PACE_SAMPLE_WORDS,
			milliseconds,
			recordedBy: caller.id,
			recordedAt: new Date()
		})
		.onConflict((conflict) =>
			conflict.columns(['channelId', 'personId']).doUpdateSet((eb) => ({
				words: eb.ref('excluded.words'),
				milliseconds: eb.ref('excluded.milliseconds'),
				recordedBy: eb.ref('excluded.recordedBy'),
				recordedAt: eb.ref('excluded.recordedAt')
			}))
		)
		.execute();
	return { wordsPerMinute: pace.wordsPerMinute };
}
