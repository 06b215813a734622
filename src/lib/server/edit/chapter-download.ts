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
	/** Each chapter as [id, startFrame, title, url]. */
	chapters: [string, number, string, string | null][];
}

/**
 * The episode and only what an export reads of its chapters, in start order (ties in the order
 * they were made), in one query. Each chapter comes as a JSON array, not an object: at 10,000
 * chapters PostgreSQL spent about two thirds of the query writing every row's keys, and Kysely's
 * camel-case pass then walked every object again (about 20% of the export's time in all, measured
 * side by side; plain rows were slower still). The SQL names its columns as the code does, so it
 * runs without the plugins.
 */
async function episodeForExport(channelId: string, episodeId: string) {
	const { rows } = await sql<ExportRow>`
		SELECT e.slug, e.frame_rate AS "frameRate", e.timecode_drop_frame AS "timecodeDropFrame",
		       e.timecode_start AS "timecodeStart", e.cut_duration_frames AS "cutDurationFrames",
		       (SELECT coalesce(json_agg(json_build_array(c.id, c.start_frame, c.title, c.url)
		                                 ORDER BY c.start_frame, c.created_at, c.id), '[]')
		        FROM chapter c WHERE c.episode_id = e.id) AS chapters
		FROM episode e
		WHERE e.id = ${episodeId} AND e.channel_id = ${channelId}`.execute(db.withoutPlugins());
	const row = rows[0];
	if (!row) return undefined;
	return {
		...row,
		chapters: row.chapters.map(([id, startFrame, title, url]) => ({ id, startFrame, title, url }))
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
