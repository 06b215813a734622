/**
 * The Storage view's one query (see storage.ts), in a module of its own that needs no database
 * connection, so that the storage bench's bare baseline (scripts/lib/bare-storage-server.ts) can
 * compile and run exactly the same SQL without the app around it.
 */
import { sql } from 'kysely';

/** Rushes of an episode published at least this many days ago are offered for archiving. */
export const ARCHIVE_AFTER_DAYS = 30;
/** The archive list is capped; its totals count every candidate. */
export const ARCHIVE_LIST_CAP = 50;

/** A keyset cursor: the last row's total and id ("1234_<uuid>"). */
export interface StorageCursor {
	totalBytes: number;
	id: string;
}

/** Per-episode sums of one channel, as common table expressions. */
function perEpisode(channelId: string, largestUpload: number) {
	return sql`
		made AS (
			SELECT f.episode_id,
				coalesce(sum(m.bytes), 0) AS made,
				coalesce(sum(m.bytes) FILTER (WHERE f.purpose = 'footage'), 0) AS rushes_made,
				coalesce(sum(m.bytes) FILTER (WHERE m.kind = 'proxy'), 0) AS proxy,
				coalesce(sum(m.bytes) FILTER (WHERE m.kind = 'poster'), 0) AS poster,
				coalesce(sum(m.bytes) FILTER (WHERE m.kind = 'sprite'), 0) AS sprite,
				coalesce(sum(m.bytes) FILTER (WHERE m.kind = 'peaks'), 0) AS peaks
			FROM media_output m JOIN footage f ON f.id = m.footage_id
			WHERE f.channel_id = ${channelId}
			GROUP BY f.episode_id
		),
		kept AS (
			SELECT episode_id,
				coalesce(sum(size_bytes) FILTER (WHERE purpose = 'footage'), 0) AS rushes,
				coalesce(sum(size_bytes) FILTER (WHERE purpose = 'cut'), 0) AS cuts
			FROM footage WHERE channel_id = ${channelId}
			GROUP BY episode_id
		),
		arriving AS (
			SELECT episode_id, sum(coalesce(size_bytes, ${largestUpload}::bigint)) AS arriving
			FROM upload WHERE channel_id = ${channelId} AND completed_at IS NULL
			GROUP BY episode_id
		),
		per AS (
			SELECT e.id, e.title, e.stage, e.publish_date,
				coalesce(k.rushes, 0)::bigint AS rushes, coalesce(k.cuts, 0)::bigint AS cuts,
				coalesce(a.arriving, 0)::bigint AS arriving,
				coalesce(m.made, 0)::bigint AS made, coalesce(m.rushes_made, 0)::bigint AS rushes_made,
				coalesce(m.proxy, 0)::bigint AS proxy, coalesce(m.poster, 0)::bigint AS poster,
				coalesce(m.sprite, 0)::bigint AS sprite, coalesce(m.peaks, 0)::bigint AS peaks,
				(coalesce(k.rushes, 0) + coalesce(k.cuts, 0) + coalesce(a.arriving, 0)
					+ coalesce(m.made, 0))::bigint AS total
			FROM episode e
			LEFT JOIN kept k ON k.episode_id = e.id
			LEFT JOIN arriving a ON a.episode_id = e.id
			LEFT JOIN made m ON m.episode_id = e.id
			WHERE e.channel_id = ${channelId}
				AND (k.episode_id IS NOT NULL OR a.episode_id IS NOT NULL OR m.episode_id IS NOT NULL)
		)`;
}

/**
 * The channel's totals, the archive candidates and one page of episodes by bytes held (largest
 * first, ties by id; `limit + 1` rows, so the caller knows whether there is a next page).
 */
export function storageQuery(
	channelId: string,
	largestUpload: number,
	limit: number,
	after: StorageCursor | undefined,
	now: Date
) {
	return sql<Record<string, unknown>>`
		WITH ${perEpisode(channelId, largestUpload)},
		published AS (
			SELECT p.id, p.title, p.rushes, p.rushes_made,
				coalesce(
					(SELECT max(sm.created_at) FROM stage_move sm
					 WHERE sm.episode_id = p.id AND sm.to_stage = 'published'),
					p.publish_date::timestamptz
				) AS published_at
			FROM per p WHERE p.stage = 'published' AND p.rushes > 0
		),
		candidates AS (
			SELECT * FROM published
			WHERE published_at <= ${now}::timestamptz - make_interval(days => ${ARCHIVE_AFTER_DAYS})
		)
		SELECT c.storage_quota_gb AS quota_gb,
			(SELECT count(*) FROM per) AS episodes_holding,
			(SELECT coalesce(sum(rushes), 0) FROM per) AS rushes,
			(SELECT coalesce(sum(cuts), 0) FROM per) AS cuts,
			(SELECT coalesce(sum(arriving), 0) FROM per) AS arriving,
			(SELECT coalesce(sum(made), 0) FROM per) AS made,
			(SELECT coalesce(sum(proxy), 0) FROM per) AS proxy,
			(SELECT coalesce(sum(poster), 0) FROM per) AS poster,
			(SELECT coalesce(sum(sprite), 0) FROM per) AS sprite,
			(SELECT coalesce(sum(peaks), 0) FROM per) AS peaks,
			(SELECT count(*) FROM candidates) AS archive_episodes,
			(SELECT coalesce(sum(rushes), 0) FROM candidates) AS archive_rushes,
			(SELECT coalesce(sum(rushes_made), 0) FROM candidates) AS archive_rushes_made,
			(SELECT coalesce(json_agg(json_build_object(
					'id', x.id, 'title', x.title, 'publishedAt', x.published_at,
					'rushesBytes', x.rushes, 'rushesMadeBytes', x.rushes_made)), '[]'::json)
			 FROM (SELECT * FROM candidates ORDER BY rushes DESC, id LIMIT ${ARCHIVE_LIST_CAP}) x
			) AS archive_list,
			(SELECT max(total) FROM per) AS largest,
			(SELECT coalesce(json_agg(json_build_object(
					'id', x.id, 'title', x.title, 'stage', x.stage, 'rushesBytes', x.rushes,
					'cutsBytes', x.cuts, 'madeBytes', x.made, 'arrivingBytes', x.arriving,
					'totalBytes', x.total) ORDER BY x.total DESC, x.id DESC), '[]'::json)
			 FROM (SELECT * FROM per
				${after ? sql`WHERE (total, id) < (${after.totalBytes}::bigint, ${after.id}::uuid)` : sql``}
				ORDER BY total DESC, id DESC LIMIT ${limit + 1}) x
			) AS page
		FROM channel c WHERE c.id = ${channelId}`;
}
