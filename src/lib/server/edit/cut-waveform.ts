/** The waveform lane of the edit timeline: which cut it draws and how far its peaks are. */
import type { MediaState } from '$lib/media';
import { db } from '../db';

export interface CutWaveform {
	/** The cut the page plays (the newest uploaded video cut); its peaks are fetched from the media API. */
	footageId: string;
	/** The peaks job's state; null when the cut has no peaks row at all. */
	state: MediaState | null;
	/** 0–1 while the job runs. */
	progress: number;
	/** Why the peaks failed or were skipped, in the crew's words. */
	message: string | null;
}

/** The newest video cut of the episode and its peaks job, in one query; null without a cut. */
export async function cutWaveformFor(
	channelId: string,
	episodeId: string
): Promise<CutWaveform | null> {
	const row = await db
		.selectFrom('footage')
		.leftJoin('mediaOutput', (join) =>
			join.onRef('mediaOutput.footageId', '=', 'footage.id').on('mediaOutput.kind', '=', 'peaks')
		)
		.select([
			'footage.id as footageId',
			'mediaOutput.state',
			'mediaOutput.progress',
			'mediaOutput.message'
		])
		.where('footage.channelId', '=', channelId)
		.where('footage.episodeId', '=', episodeId)
		.where('footage.purpose', '=', 'cut')
		.where('footage.fileType', 'like', 'video/%')
		.orderBy('footage.createdAt', 'desc')
		.limit(1)
		.executeTakeFirst();
	if (!row) return null;
	return {
		footageId: row.footageId,
		state: row.state ?? null,
		progress: row.progress ?? 0,
		message: row.message ?? null
	};
}
