/**
 * The chapter list as a file (description text, WebVTT, FFmpeg metadata, JSON, CSV), read with a
 * single query (see scripts/bench.ts). Only the exports refuse (422) a list that breaks a chapter
 * rule; the edit page reports the same rules without refusing (edit.ts).
 */
import { jsonArrayFrom } from 'kysely/helpers/postgres';
import { db } from '../db';
import { DomainError } from '../http/api';
import { isUuid } from '../auth/identity';
import { episodeNotFound } from '../episodes/episodes';
import { problemsOf } from './edit';
import { clockOfEpisode } from '../episodes/programme-timecode';
import { ChapterExportError, exportChapters, type ChapterFormat } from '$lib/chapters';

export interface ChapterDownload {
	body: string;
	contentType: string;
	filename: string;
	/** Where the server's time went, for the Server-Timing header. */
	timing: { queryMilliseconds: number; renderMilliseconds: number };
}

/** A file name from the slug, kept to characters every download dialog and header accepts. */
function downloadName(slug: string, extension: string): string {
	const safe = slug.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-+|-+$/g, '') || 'episode';
	return `${safe}-chapters.${extension}`;
}

/**
 * The episode with only what an export reads of its chapters, in start order (ties in the order
 * they were made), in one query: the chapter_episode_order index hands them over already sorted.
 */
function episodeForExport(channelId: string, episodeId: string) {
	return db
		.selectFrom('episode')
		.select((eb) => [
			'episode.slug',
			'episode.frameRate',
			'episode.timecodeDropFrame',
			'episode.timecodeStart',
			'episode.cutDurationFrames',
			jsonArrayFrom(
				eb
					.selectFrom('chapter')
					.select(['chapter.id', 'chapter.startFrame', 'chapter.title', 'chapter.url'])
					.whereRef('chapter.episodeId', '=', 'episode.id')
					.orderBy('chapter.startFrame')
					.orderBy('chapter.createdAt')
					.orderBy('chapter.id')
			).as('chapters')
		])
		.where('episode.id', '=', episodeId)
		.where('episode.channelId', '=', channelId)
		.executeTakeFirst();
}

/**
 * The chapters in one export format, read with a single query. 422 with the problems (per chapter)
 * when the list breaks a chapter rule, since a half-finished list must not reach a description.
 */
export async function chapterDownloadFor(
	channelId: string,
	episodeId: string,
	format: ChapterFormat
): Promise<ChapterDownload> {
	if (!isUuid(episodeId)) throw episodeNotFound();
	const started = performance.now();
	const row = await episodeForExport(channelId, episodeId);
	const queried = performance.now();
	if (!row) throw episodeNotFound();
	const rate = row.frameRate;
	const problems = problemsOf(row.chapters, row.cutDurationFrames, rate);
	if (problems.length > 0) {
		throw new DomainError(
			422,
			`These chapters can't be exported yet: ${problems.length === 1 ? 'one rule is' : `${problems.length} rules are`} broken. Fix what is listed, then download again.`,
			undefined,
			{ problems }
		);
	}
	try {
		const exported = exportChapters(format, row.chapters, {
			rate,
			cutEndFrame: row.cutDurationFrames ?? 0,
			// The CSV's timecode column only; description, WebVTT, FFmpeg and JSON count from 0:00.
			programme: clockOfEpisode(row)
		});
		return {
			body: exported.body,
			contentType: exported.contentType,
			filename: downloadName(row.slug, exported.extension),
			timing: {
				queryMilliseconds: queried - started,
				renderMilliseconds: performance.now() - queried
			}
		};
	} catch (failure) {
		// The rules above cover what the exporter checks; this keeps any gap a 422 in plain words.
		if (failure instanceof ChapterExportError)
			throw new DomainError(422, failure.message, undefined, {
				problems: [{ chapterId: null, field: 'list', message: failure.message }]
			});
		throw failure;
	}
}
