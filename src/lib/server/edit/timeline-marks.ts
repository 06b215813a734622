/**
 * What the edit timeline shows besides chapters, gathered from each area in one place:
 * placed cautions (rundown), segment notes and the parts they show, spec cards, open review comments
 * on the current version, and the current version of the cut.
 */
import { jsonArrayFrom } from 'kysely/helpers/postgres';
import { db } from '../db';
import type { TimelineMark } from '$lib/components/timeline';
import { specCardsFor } from './spec-cards';
import { cautionMarksFor } from '../episodes/cautions';
import { secondsToFrames } from '$lib/timecode';
import type { MediaState } from '$lib/media';

export async function timelineMarksFor(
	channelId: string,
	episodeId: string
): Promise<TimelineMark[]> {
	const [cautions, notes, specCards] = await Promise.all([
		cautionMarksFor(channelId, episodeId),
		placedNotes(channelId, episodeId),
		specCardMarksFor(channelId, episodeId)
	]);
	return [...cautions, ...notes, ...specCards];
}

/** The episode's placed spec cards as timeline marks, in program-time order; each links to the card on the spec-cards page. */
export async function specCardMarksFor(
	channelId: string,
	episodeId: string
): Promise<TimelineMark[]> {
	const board = await specCardsFor(channelId, episodeId);
	return board.cards
		.filter((view) => view.atFrame !== null)
		.map((view) => ({
			kind: 'spec-card' as const,
			atFrame: view.atFrame!,
			label: `${view.kindLabel}: ${view.card?.heading ?? 'needs checking'}`,
			href: `/episodes/${board.episode.id}/spec-cards?edit=${view.id}#card-form`
		}));
}

/** Notes placed in the cut, and each part they link as its own mark at the same frame. */
async function placedNotes(channelId: string, episodeId: string): Promise<TimelineMark[]> {
	const rows = await db
		.selectFrom('segmentNote')
		.innerJoin('episode', 'episode.id', 'segmentNote.episodeId')
		.leftJoin('segmentNotePart', 'segmentNotePart.noteId', 'segmentNote.id')
		.leftJoin('part', 'part.id', 'segmentNotePart.partId')
		.select([
			'segmentNote.id',
			'segmentNote.programFrame',
			'segmentNote.text',
			'part.sku',
			'part.name as partName'
		])
		.where('episode.id', '=', episodeId)
		.where('episode.channelId', '=', channelId)
		.where('segmentNote.programFrame', 'is not', null)
		.orderBy('segmentNote.programFrame')
		.execute();
	const marks: TimelineMark[] = [];
	const seen = new Set<string>();
	for (const row of rows) {
		const href = `/episodes/${episodeId}/notes#note-${row.id}`;
		if (!seen.has(row.id)) {
			seen.add(row.id);
			marks.push({
				kind: 'note',
				atFrame: row.programFrame!,
				label: row.text.length > 80 ? row.text.slice(0, 79) + '…' : row.text,
				href
			});
		}
		if (row.sku)
			marks.push({
				kind: 'part',
				atFrame: row.programFrame!,
				label: `${row.sku} ${row.partName}`,
				href: `/episodes/${episodeId}/parts`
			});
	}
	return marks;
}

/** The current cut's sound lane: which file it draws and how far its peaks job is. */
export interface CutWaveform {
	/** The version's file; its peaks are fetched from the media API. */
	footageId: string;
	/** The peaks job's state; null when the file has no peaks row at all. */
	state: MediaState | null;
	/** 0–1 while the job runs. */
	progress: number;
	/** Why the peaks failed or were skipped, in the crew's words. */
	message: string | null;
}

/**
 * The current version of the cut (the newest upload, a numbered version) as a URL a video element
 * can seek in, with its label and length: the edit timeline works on it.
 */
export async function currentCutFor(
	channelId: string,
	episodeId: string
): Promise<{
	url: string | null;
	label: string;
	lengthFrames: number | null;
	/** Open review comments (all on the current version: they carry over) as timeline marks. */
	commentMarks: TimelineMark[];
	/** The version's sound lane (CutWaveform.svelte): null when the version is not a video. */
	waveform: CutWaveform | null;
} | null> {
	// One query for the version, its peaks job and its open comments: the edit tab's query budget
	// has no room for more.
	const cut = await db
		.selectFrom('cutVersion')
		.innerJoin('footage', 'footage.id', 'cutVersion.footageId')
		.innerJoin('episode', 'episode.id', 'cutVersion.episodeId')
		.leftJoin('mediaOutput', (join) =>
			join.onRef('mediaOutput.footageId', '=', 'footage.id').on('mediaOutput.kind', '=', 'peaks')
		)
		.select((eb) => [
			'footage.id',
			'footage.fileType',
			'footage.durationSeconds',
			'cutVersion.number',
			'episode.frameRate',
			'mediaOutput.state as peaksState',
			'mediaOutput.progress as peaksProgress',
			'mediaOutput.message as peaksMessage',
			jsonArrayFrom(
				eb
					.selectFrom('cutComment')
					.select(['cutComment.id', 'cutComment.startFrame', 'cutComment.body'])
					.whereRef('cutComment.episodeId', '=', 'episode.id')
					.where('cutComment.state', '=', 'open')
					.orderBy('cutComment.startFrame')
			).as('openComments')
		])
		.where('episode.channelId', '=', channelId)
		.where('episode.id', '=', episodeId)
		.orderBy('cutVersion.number', 'desc')
		.limit(1)
		.executeTakeFirst();
	if (!cut) return null;
	const video = cut.fileType.startsWith('video/');
	return {
		url: video ? `/api/footage/${cut.id}/file` : null,
		waveform: video
			? {
					footageId: cut.id,
					state: cut.peaksState ?? null,
					progress: cut.peaksProgress ?? 0,
					message: cut.peaksMessage ?? null
				}
			: null,
		label: `v${cut.number}`,
		lengthFrames:
			cut.durationSeconds === null
				? null
				: secondsToFrames(Number(cut.durationSeconds), cut.frameRate),
		commentMarks: cut.openComments.map((row) => ({
			kind: 'comment' as const,
			atFrame: row.startFrame,
			label: `v${cut.number}: ${row.body.length > 80 ? row.body.slice(0, 79) + '…' : row.body}`,
			href: `/episodes/${episodeId}/screening#comment-${row.id}`
		}))
	};
}
