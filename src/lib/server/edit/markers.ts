/**
 * Markers out to an edit system and chapter markers back in. `markersFor` gathers everything the
 * cut carries as one generic list (chapters, placed caution cards, placed spec cards, open review
 * comments); the files are written by $lib/edit/edl.ts
 * and otio.ts at the episode's programme clock. An import reads a file the editor uploads, shows
 * what would change, and writes it on confirm in one transaction behind the stage lock.
 */
import { sql } from 'kysely';
import { db } from '../db';
import { DomainError } from '../http/api';
import { isUuid } from '../auth/identity';
import { episodeNotFound, type Executor } from '../episodes/episodes';
import { episodeOpenFor } from '../episodes/stage-locks';
import { clockOfEpisode } from '../episodes/programme-timecode';
import { episodeWithChapters, editStateFor, type EditState } from './edit';
import { specCardsFor } from './spec-cards';
import { hazardById } from '$lib/cautions';
import type { SpecCard } from '$lib/specs/cards';
import { editLocks, type Stage } from '$lib/stages';
import type { ProgrammeClock } from '$lib/timecode';
import { oneLine, type Marker, type MarkerRead } from '$lib/edit/markers';
import { readEdl, writeEdl } from '$lib/edit/edl';
import { readOtio, writeOtio } from '$lib/edit/otio';
import {
	chapterListBasis,
	planChapterImport,
	type ExistingChapter,
	type MarkerImportPreview
} from '$lib/edit/chapter-import';
import type { MarkerFormat, MarkerImport } from '$lib/schemas/markers';

type EpisodeRow = NonNullable<Awaited<ReturnType<typeof episodeWithChapters>>>;

/** Chapters run to the next chapter's start, the last to the cut's end. */
function chapterMarkers(row: EpisodeRow): Marker[] {
	return row.chapters.map((chapter, index) => {
		const end = row.chapters[index + 1]?.startFrame ?? row.cutDurationFrames ?? chapter.startFrame;
		return {
			frame: chapter.startFrame,
			durationFrames: Math.max(0, end - chapter.startFrame),
			kind: 'chapter',
			name: chapter.title,
			note: chapter.url ?? ''
		};
	});
}

/** Placed caution cards of flagged hazards, with their words as the note and their time on screen. */
async function cautionMarkers(episodeId: string, executor: Executor): Promise<Marker[]> {
	const rows = await executor
		.selectFrom('caution')
		.innerJoin('segment', 'segment.id', 'caution.segmentId')
		.select(['caution.hazard', 'caution.text', 'caution.atFrame', 'caution.durationFrames'])
		.where('segment.episodeId', '=', episodeId)
		.where('caution.atFrame', 'is not', null)
		.where(sql<boolean>`caution.hazard = ANY(segment.hazards)`)
		.orderBy('caution.atFrame')
		.execute();
	return rows.map((row) => ({
		frame: row.atFrame!,
		durationFrames: row.durationFrames ?? 0,
		kind: 'caution',
		name: `Caution: ${hazardById(row.hazard)?.label ?? row.hazard}`,
		note: row.text
	}));
}

/** Placed spec cards with their heading and their time on screen. */
async function specMarkers(
	channelId: string,
	episodeId: string,
	executor: Executor
): Promise<Marker[]> {
	const board = await specCardsFor(channelId, episodeId, executor);
	return board.cards
		.filter((view) => view.atFrame !== null)
		.map((view) => ({
			frame: view.atFrame!,
			durationFrames: view.durationFrames,
			kind: 'spec',
			name: `${view.kindLabel}: ${view.card?.heading ?? 'needs checking'}`,
			note: view.card ? specNote(view.card) : ''
		}));
}

/** A card's figures, body and its own cautions, as one line for the edit system. */
function specNote(card: SpecCard): string {
	return [
		...card.lines.map((line) => `${line.label} ${line.imperial} (${line.metric})`),
		card.body ?? '',
		...card.cautions
	]
		.filter((part) => part.trim() !== '')
		.join(' · ');
}

/**
 * Open review comments (they all sit on the current version: open ones carry over), each at its
 * frame or over its range, named by who wrote it, with its words as the note.
 */
async function commentMarkers(episodeId: string, executor: Executor): Promise<Marker[]> {
	const rows = await executor
		.selectFrom('cutComment')
		.innerJoin('cutVersion', 'cutVersion.id', 'cutComment.cutVersionId')
		.leftJoin('person', 'person.id', 'cutComment.authorId')
		.select([
			'cutComment.startFrame',
			'cutComment.endFrame',
			'cutComment.body',
			'cutVersion.number',
			'person.name'
		])
		.where('cutComment.episodeId', '=', episodeId)
		.where('cutComment.state', '=', 'open')
		.orderBy('cutComment.startFrame')
		.orderBy('cutComment.createdAt')
		.execute();
	return rows.map((row) => ({
		frame: row.startFrame,
		durationFrames: Math.max(0, (row.endFrame ?? row.startFrame) - row.startFrame),
		kind: 'comment',
		name: `Review v${row.number}: ${row.name ?? 'former crew member'}`,
		note: row.body
	}));
}

/** The episode and every marker its cut carries; 404 for another channel's episode. */
export async function markersFor(
	channelId: string,
	episodeId: string,
	executor: Executor = db
): Promise<{ episode: EpisodeRow; clock: ProgrammeClock; markers: Marker[] }> {
	if (!isUuid(episodeId)) throw episodeNotFound();
	const episode = await episodeWithChapters(channelId, episodeId, executor);
	if (!episode) throw episodeNotFound();
	const lists = await Promise.all([
		chapterMarkers(episode),
		cautionMarkers(episode.id, executor),
		specMarkers(channelId, episode.id, executor),
		commentMarkers(episode.id, executor)
	]);
	return { episode, clock: clockOfEpisode(episode), markers: lists.flat() };
}

export interface MarkerDownload {
	body: string;
	contentType: string;
	filename: string;
}

const MARKER_FILES: Record<MarkerFormat, { extension: string; contentType: string }> = {
	// No registered media type for an EDL: plain text is what edit systems read.
	edl: { extension: 'edl', contentType: 'text/plain; charset=utf-8' },
	otio: { extension: 'otio', contentType: 'application/json; charset=utf-8' }
};

/** Every marker of the episode as an EDL or an OpenTimelineIO file. */
export async function markerDownloadFor(
	channelId: string,
	episodeId: string,
	format: MarkerFormat
): Promise<MarkerDownload> {
	const { episode, clock, markers } = await markersFor(channelId, episodeId);
	const body =
		format === 'edl'
			? writeEdl(markers, episode.title, clock)
			: writeOtio(markers, episode.title, clock, episode.cutDurationFrames);
	const safe = episode.slug.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-+|-+$/g, '') || 'episode';
	const file = MARKER_FILES[format];
	return { body, contentType: file.contentType, filename: `${safe}-markers.${file.extension}` };
}

/** The format a file is in: as asked, else by its name, else by its first character. */
function formatOf(input: MarkerImport): MarkerFormat {
	if (input.format) return input.format;
	const name = (input.fileName ?? '').toLowerCase();
	if (name.endsWith('.edl')) return 'edl';
	if (name.endsWith('.otio') || name.endsWith('.json')) return 'otio';
	return input.text.trimStart().startsWith('{') ? 'otio' : 'edl';
}

function readFile(input: MarkerImport, clock: ProgrammeClock): MarkerRead {
	const format = formatOf(input);
	const read = format === 'edl' ? readEdl(input.text, clock) : readOtio(input.text, clock);
	if (read.errors.length > 0) {
		const count = read.errors.length;
		throw new DomainError(
			422,
			`${count === 1 ? 'One row' : `${count} rows`} of this file can't be read, so nothing was changed. Fix ${count === 1 ? 'it' : 'them'} in the edit system (or the file), export again and upload.`,
			undefined,
			{ rows: read.errors, format }
		);
	}
	return read;
}

function chaptersOf(executor: Executor, episodeId: string): Promise<ExistingChapter[]> {
	return executor
		.selectFrom('chapter')
		.select(['id', 'startFrame', 'title', 'version'])
		.where('episodeId', '=', episodeId)
		.orderBy('startFrame')
		.orderBy('createdAt')
		.orderBy('id')
		.execute();
}

function previewOf(
	input: MarkerImport,
	existing: ExistingChapter[],
	clock: ProgrammeClock,
	stage: string
): MarkerImportPreview {
	const read = readFile(input, clock);
	const plan = planChapterImport(existing, read.markers);
	const counts = { added: 0, moved: 0, renamed: 0, unchanged: 0 };
	for (const change of plan.changes) counts[change.change]++;
	return {
		format: formatOf(input),
		changes: plan.changes.map((change) => ({
			...change,
			title: oneLine(change.title),
			timecode: clock.format(change.frame),
			...(change.change === 'moved' ? { fromTimecode: clock.format(change.fromFrame) } : {})
		})),
		kept: plan.kept.map((chapter) => ({ ...chapter, timecode: clock.format(chapter.frame) })),
		skipped: plan.skipped,
		counts,
		basis: chapterListBasis(existing),
		lock: editLocks(stage as Stage).chapters
	};
}

/** What the file would change in the chapter list; writes nothing. 422 with the bad rows. */
export async function previewMarkerImport(
	channelId: string,
	episodeId: string,
	input: MarkerImport
): Promise<MarkerImportPreview> {
	if (!isUuid(episodeId)) throw episodeNotFound();
	const episode = await episodeWithChapters(channelId, episodeId, db);
	if (!episode) throw episodeNotFound();
	const existing = await chaptersOf(db, episode.id);
	return previewOf(input, existing, clockOfEpisode(episode), episode.stage);
}

/**
 * Writes the preview's changes in one transaction, behind the stage lock (409 when the stage has
 * fixed the chapters). 409 with a fresh preview when the chapter list changed since the preview.
 */
export async function confirmMarkerImport(
	channelId: string,
	episodeId: string,
	input: MarkerImport
): Promise<{ preview: MarkerImportPreview; state: EditState }> {
	return db.transaction().execute(async (trx) => {
		const episode = await episodeOpenFor(trx, channelId, 'chapters', { episodeId });
		const existing = await chaptersOf(trx, episode.id);
		const preview = previewOf(input, existing, clockOfEpisode(episode), episode.stage);
		if (preview.basis !== input.basis) {
			throw new DomainError(
				409,
				'The chapters changed since this preview (someone saved one). Look over the new preview and confirm again.',
				undefined,
				{ preview }
			);
		}
		const added = preview.changes.filter((change) => change.change === 'added');
		if (added.length > 0)
			await trx
				.insertInto('chapter')
				.values(
					added.map((change) => ({
						episodeId: episode.id,
						startFrame: change.frame,
						title: change.title,
						url: null,
						partId: null
					}))
				)
				.execute();
		for (const change of preview.changes) {
			if (change.change !== 'moved' && change.change !== 'renamed') continue;
			// The row is the one the basis vouched for, and the episode lock keeps other writers out.
			await trx
				.updateTable('chapter')
				.set((eb) => ({
					...(change.change === 'moved' ? { startFrame: change.frame } : { title: change.title }),
					version: eb('version', '+', 1)
				}))
				.where('id', '=', change.id)
				.where('episodeId', '=', episode.id)
				.execute();
		}
		return { preview, state: await editStateFor(channelId, episode.id, trx) };
	});
}
