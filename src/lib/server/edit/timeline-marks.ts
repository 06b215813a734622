/**
 * What the edit timeline shows besides chapters, gathered from each area in one place:
 * placed cautions (rundown), segment notes and the parts they show, spec cards, and the uploaded cut.
 */
import { db } from '../db';
import type { TimelineMark } from '$lib/components/timeline';
import { specCardsFor } from './spec-cards';
import { cautionMarksFor } from '../episodes/cautions';

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

/** The newest uploaded proxy or final cut of the episode, as a URL a video element can seek in. */
export async function cutVideoUrlFor(channelId: string, episodeId: string): Promise<string | null> {
	const cut = await db
		.selectFrom('footage')
		.select('id')
		.where('channelId', '=', channelId)
		.where('episodeId', '=', episodeId)
		.where('purpose', '=', 'cut')
		.where('fileType', 'like', 'video/%')
		.orderBy('createdAt', 'desc')
		.limit(1)
		.executeTakeFirst();
	return cut ? `/api/footage/${cut.id}/file` : null;
}
