/**
 * The Storage view: what a channel holds against its quota, per episode and per kind, and which
 * published episodes' rushes could go to long-term storage. One grouped query per request, however
 * many episodes the channel has: the channel's totals, the archive list and a keyset page of
 * episodes (largest first). Sizes are bytes; pages show them in decimal units.
 *
 * What counts against the quota is what `upload-limits.ts` counts: finished footage (rushes and
 * cuts) and the declared length of every unfinished upload (an unknown length counts as the largest
 * upload allowed). Made files (proxies, posters, thumbnail sprites, waveform peaks) sit beside the
 * clip on disk and are shown, but do not count against the quota.
 */
import { db } from '../db';
import type { Stage } from '$lib/stages';
import { GB } from './upload-limits';
import { ARCHIVE_AFTER_DAYS, storageQuery, type StorageCursor } from './storage-query';

export { ARCHIVE_AFTER_DAYS, ARCHIVE_LIST_CAP, type StorageCursor } from './storage-query';

/** Episodes on one page of the view, and the most an API caller may ask for. */
export const EPISODES_PER_PAGE = 50;
export const MOST_EPISODES_PER_PAGE = 200;

export interface EpisodeStorage {
	id: string;
	title: string;
	stage: Stage;
	rushesBytes: number;
	cutsBytes: number;
	madeBytes: number;
	arrivingBytes: number;
	totalBytes: number;
}

export interface ArchiveCandidate {
	id: string;
	title: string;
	publishedAt: string;
	rushesBytes: number;
	/** Made files of those rushes: they go with the clip, so archiving frees them on disk too. */
	rushesMadeBytes: number;
}

export interface ChannelStorage {
	quotaBytes: number;
	/** Counted against the quota: rushes + cuts + arriving. */
	countedBytes: number;
	rushesBytes: number;
	cutsBytes: number;
	arrivingBytes: number;
	madeBytes: number;
	madeByKind: { proxy: number; poster: number; sprite: number; peaks: number };
	episodesHolding: number;
	archive: {
		afterDays: number;
		episodes: number;
		rushesBytes: number;
		rushesMadeBytes: number;
		list: ArchiveCandidate[];
	};
}

export interface StoragePage {
	episodes: EpisodeStorage[];
	/** The largest episode's total, on every page: the bars of all pages share one scale. */
	largestBytes: number;
	/** Pass as `after` for the next page; null on the last page. */
	next: string | null;
}

export const cursorText = (row: { totalBytes: number; id: string }) =>
	`${row.totalBytes}_${row.id}`;

const n = (value: unknown) => Number(value ?? 0);

/**
 * The channel's totals, the archive candidates and one page of episodes by bytes held (largest
 * first, ties by id): one query, so the per-episode sums are worked out once per request.
 */
export async function storageView(
	channelId: string,
	largestUpload: number,
	options: { after?: StorageCursor; limit?: number } = {},
	now = new Date()
): Promise<{ channel: ChannelStorage } & StoragePage> {
	const limit = options.limit ?? EPISODES_PER_PAGE;
	const after = options.after;
	const { rows } = await storageQuery(channelId, largestUpload, limit, after, now).execute(db);
	const row = rows[0] ?? {};
	const rushesBytes = n(row.rushes);
	const cutsBytes = n(row.cuts);
	const arrivingBytes = n(row.arriving);
	const list = (row.archiveList ?? []) as Record<string, unknown>[];
	const pageRows = (row.page ?? []) as Record<string, unknown>[];
	const episodes: EpisodeStorage[] = pageRows.slice(0, limit).map((item) => ({
		id: String(item.id),
		title: String(item.title),
		stage: item.stage as Stage,
		rushesBytes: n(item.rushesBytes),
		cutsBytes: n(item.cutsBytes),
		madeBytes: n(item.madeBytes),
		arrivingBytes: n(item.arrivingBytes),
		totalBytes: n(item.totalBytes)
	}));
	const last = episodes.at(-1);
	const channel: ChannelStorage = {
		quotaBytes: n(row.quotaGb) * GB,
		countedBytes: rushesBytes + cutsBytes + arrivingBytes,
		rushesBytes,
		cutsBytes,
		arrivingBytes,
		madeBytes: n(row.made),
		madeByKind: {
			proxy: n(row.proxy),
			poster: n(row.poster),
			sprite: n(row.sprite),
			peaks: n(row.peaks)
		},
		episodesHolding: n(row.episodesHolding),
		archive: {
			afterDays: ARCHIVE_AFTER_DAYS,
			episodes: n(row.archiveEpisodes),
			rushesBytes: n(row.archiveRushes),
			rushesMadeBytes: n(row.archiveRushesMade),
			list: list.map((item) => ({
				id: String(item.id),
				title: String(item.title),
				publishedAt: new Date(String(item.publishedAt)).toISOString(),
				rushesBytes: n(item.rushesBytes),
				rushesMadeBytes: n(item.rushesMadeBytes)
			}))
		}
	};
	return {
		channel,
		episodes,
		largestBytes: n(row.largest),
		next: pageRows.length > limit && last ? cursorText(last) : null
	};
}
