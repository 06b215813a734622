/**
 * What a marker file would change in the chapter list, worked out before anything is written:
 * each chapter marker of the file is unchanged (same start and title as a chapter), renamed (a
 * chapter at its start has another title), moved (a chapter of its title starts elsewhere) or
 * added. Chapters the file doesn't name are kept as they are: an import never removes one.
 * Pure module, shared by the server (which writes the plan) and the page (which shows it).
 */
import type { ReadMarker } from './markers';

export interface ExistingChapter {
	id: string;
	startFrame: number;
	title: string;
	version: number;
}

export type ChapterChange =
	| { change: 'added'; where: string; frame: number; title: string }
	| { change: 'moved'; where: string; id: string; fromFrame: number; frame: number; title: string }
	| {
			change: 'renamed';
			where: string;
			id: string;
			frame: number;
			fromTitle: string;
			title: string;
	  }
	| { change: 'unchanged'; where: string; id: string; frame: number; title: string };

export interface ChapterImportPlan {
	changes: ChapterChange[];
	/** Chapters the file leaves out; they stay. */
	kept: { id: string; frame: number; title: string }[];
	/** Markers of other kinds (cautions, spec cards, comments): not chapters, so not imported. */
	skipped: number;
}

const sameTitle = (a: string, b: string) => a.trim().toLowerCase() === b.trim().toLowerCase();

/** The plan for the file's chapter markers (a marker of no kind of ours counts as a chapter). */
export function planChapterImport(
	existing: readonly ExistingChapter[],
	markers: readonly ReadMarker[]
): ChapterImportPlan {
	const chapters = markers.filter((marker) => marker.kind === null || marker.kind === 'chapter');
	const free = new Set(existing.map((chapter) => chapter.id));
	const changes: (ChapterChange | null)[] = chapters.map(() => null);
	const claim = (test: (chapter: ExistingChapter) => boolean) => {
		const chapter = existing.find((candidate) => free.has(candidate.id) && test(candidate));
		if (chapter) free.delete(chapter.id);
		return chapter;
	};
	// Exact matches first, so a renamed or moved neighbour can't take a chapter that is unchanged.
	chapters.forEach((marker, index) => {
		const chapter = claim(
			(candidate) => candidate.startFrame === marker.frame && candidate.title === marker.name
		);
		if (chapter)
			changes[index] = {
				change: 'unchanged',
				where: marker.where,
				id: chapter.id,
				frame: marker.frame,
				title: chapter.title
			};
	});
	chapters.forEach((marker, index) => {
		if (changes[index]) return;
		const atFrame = claim((candidate) => candidate.startFrame === marker.frame);
		if (atFrame) {
			changes[index] = {
				change: 'renamed',
				where: marker.where,
				id: atFrame.id,
				frame: marker.frame,
				fromTitle: atFrame.title,
				title: marker.name
			};
			return;
		}
		const titled = claim((candidate) => sameTitle(candidate.title, marker.name));
		changes[index] = titled
			? {
					change: 'moved',
					where: marker.where,
					id: titled.id,
					fromFrame: titled.startFrame,
					frame: marker.frame,
					title: marker.name
				}
			: { change: 'added', where: marker.where, frame: marker.frame, title: marker.name };
	});
	return {
		changes: changes.filter((change): change is ChapterChange => change !== null),
		kept: existing
			.filter((chapter) => free.has(chapter.id))
			.map((chapter) => ({ id: chapter.id, frame: chapter.startFrame, title: chapter.title })),
		skipped: markers.length - chapters.length
	};
}

/** A change of the preview with its labels in the episode's programme timecode. */
export type ChapterChangeView = ChapterChange & { timecode: string; fromTimecode?: string };

/** What the server answers for a file before anything is written (and with a confirm). */
export interface MarkerImportPreview {
	format: 'edl' | 'otio';
	changes: ChapterChangeView[];
	kept: { id: string; frame: number; title: string; timecode: string }[];
	skipped: number;
	counts: Record<ChapterChange['change'], number>;
	/** Send it back with the confirm: the chapter list this preview was made from. */
	basis: string;
	/** Why the chapters can't change at this stage (null: they can). */
	lock: string | null;
}

/** A short fingerprint of the chapter list a preview was made from, so a confirm can tell it changed. */
export function chapterListBasis(existing: readonly ExistingChapter[]): string {
	const text = existing
		.map((chapter) => `${chapter.id}:${chapter.version}`)
		.sort()
		.join(',');
	// FNV-1a, 32 bits: enough to tell two states of one episode's list apart, not a security check.
	let hash = 0x811c9dc5;
	for (let index = 0; index < text.length; index++) {
		hash ^= text.charCodeAt(index);
		hash = Math.imul(hash, 0x01000193) >>> 0;
	}
	return `${existing.length}-${hash.toString(16).padStart(8, '0')}`;
}
