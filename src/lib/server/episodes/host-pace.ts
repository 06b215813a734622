/**
 * The assigned host's speaking pace, which turns a script's words into spoken time on the rundown,
 * the script pages and the script preview.
 */
import { db } from '../db';
import type { Executor } from './episodes';
import { calibratePace, DEFAULT_WORDS_PER_MINUTE, type CalibratedPace } from '$lib/script/timing';
import { spokenWordsEach } from './script-reader';
import { framesToSeconds } from '$lib/timecode';

export interface HostPace extends CalibratedPace {
	hostName: string | null;
}

/**
 * The assigned host's pace: words ÷ recorded minutes over their earlier segments whose length in
 * the cut is known (calibratePace in $lib/script/timing), else the 150 wpm default.
 */
export async function hostPaceFor(
	channelId: string,
	episodeId: string,
	executor: Executor = db
): Promise<HostPace> {
	const host = await executor
		.selectFrom('episodeAssignment')
		.innerJoin('person', 'person.id', 'episodeAssignment.personId')
		.select(['person.id', 'person.name'])
		.where('episodeAssignment.episodeId', '=', episodeId)
		.where('episodeAssignment.role', '=', 'host')
		.executeTakeFirst();
	if (!host)
		return {
			wordsPerMinute: DEFAULT_WORDS_PER_MINUTE,
			basedOn: 0,
			calibrated: false,
			hostName: null
		};
	const recorded = await executor
		.selectFrom('segment')
		.innerJoin('episode', 'episode.id', 'segment.episodeId')
		.innerJoin('episodeAssignment', (join) =>
			join
				.onRef('episodeAssignment.episodeId', '=', 'episode.id')
				.on('episodeAssignment.role', '=', 'host')
		)
		.innerJoin('segmentScript', 'segmentScript.segmentId', 'segment.id')
		.select(['segment.recordedFrames', 'episode.frameRate', 'segmentScript.body'])
		.where('episode.channelId', '=', channelId)
		.where('episodeAssignment.personId', '=', host.id)
		.where('segment.recordedFrames', 'is not', null)
		.execute();
	const words = await spokenWordsEach(recorded.map((row) => row.body));
	const samples = recorded.map((row, index) => ({
		words: words[index],
		recordedSeconds: framesToSeconds(row.recordedFrames!, row.frameRate)
	}));
	return { ...calibratePace(samples), hostName: host.name };
}
