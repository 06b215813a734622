/**
 * The chapter list as a file (description text, WebVTT, FFmpeg metadata, JSON, CSV), read with a
 * single query (see scripts/bench.ts). Only the exports refuse (422) a list that breaks a chapter
 * rule; the edit page reports the same rules without refusing (edit.ts).
 */
import { sql } from 'kysely';
import { db } from '../db';
import { DomainError } from '../http/api';
import { isUuid } from '../auth/identity';
import { episodeNotFound } from '../episodes/episodes';
import { problemsOf } from './edit';
import { clockOfEpisode } from '../episodes/programme-timecode';
import { ChapterExportError, exportChapters, type ChapterFormat } from '$lib/chapters';
import type { FrameRate } from '$lib/timecode';

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

interface ExportRow {
	slug: string;
	frameRate: FrameRate;
	timecodeDropFrame: boolean | null;
	timecodeStart: string;
	cutDurationFrames: number | null;
	/**
	 * The chapters column by column, in start order: [ids, start frames, titles, urls]. Each array
	 * is null when the episode has no chapter (array_agg of no rows).
	 */
	chapters: [string[] | null, number[] | null, string[] | null, (string | null)[] | null];
}

/**
 * The episode and only what an export reads of its chapters, in start order (ties in the order
 * they were made), in one query. The chapters come as four JSON arrays, one per column, not as a
 * JSON value per chapter: PostgreSQL builds four arrays instead of 10,000 small ones and the JSON
 * is smaller to send and parse. At 10,000 chapters (npm run bench:seed's episode, 2026-12-04, 15
 * interleaved runs): execution 8.0 → 5.7 ms median, the whole query as the app sees it 23 → 16 ms.
 * (Before that, an object per chapter had cost more again: PostgreSQL wrote every row's keys and
 * Kysely's camel-case pass walked every object.) The subquery's ORDER BY gives the order: its
 * rows reach the aggregates in that order when, as here, the outer level has no join or grouping
 * of its own (PostgreSQL's documentation, "Aggregate Expressions"); the chapter_episode_order index
 * yields them sorted, so nothing is sorted at all. The SQL names its columns as the code does, so
 * it runs without the plugins.
 */
async function episodeForExport(channelId: string, episodeId: string) {
	const { rows } = await sql<ExportRow>`
		SELECT e.slug, e.frame_rate AS "frameRate", e.timecode_drop_frame AS "timecodeDropFrame",
		       e.timecode_start AS "timecodeStart", e.cut_duration_frames AS "cutDurationFrames",
		       (SELECT json_build_array(array_agg(c.id), array_agg(c.start_frame),
		                                array_agg(c.title), array_agg(c.url))
		        FROM (SELECT c.id, c.start_frame, c.title, c.url FROM chapter c
		              WHERE c.episode_id = e.id
		              ORDER BY c.start_frame, c.created_at, c.id) c) AS chapters
		FROM episode e
		WHERE e.id = ${episodeId} AND e.channel_id = ${channelId}`.execute(db.withoutPlugins());
	const row = rows[0];
	if (!row) return undefined;
	const [ids, startFrames, titles, urls] = row.chapters;
	return {
		...row,
		chapters: (ids ?? []).map((id, index) => ({
			id,
			startFrame: startFrames![index],
			title: titles![index],
			url: urls![index]
		}))
	};
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
