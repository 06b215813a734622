/**
 * A page's form acts on the episode or shoot day in its address. The domain calls check an id
 * against the caller's channel; these check it against the page's own episode or day too, so a
 * form (or an edited one) can't change a record of another episode from here.
 */
import { sql } from 'kysely';
import { db } from '../db';
import { DomainError } from './api';
import { isUuid } from '../auth/identity';

export type EpisodeRecord = 'segment' | 'shot' | 'take' | 'note' | 'footage';
export type ShootDayRecord = 'camera' | 'gear' | 'pull';

const labels: Record<EpisodeRecord | ShootDayRecord, string> = {
	segment: 'That segment',
	shot: 'That shot',
	take: 'That take',
	note: 'That note',
	footage: 'That clip',
	camera: 'That camera',
	gear: 'That gear item',
	pull: 'That pull-list item'
};

const notHere = (kind: EpisodeRecord | ShootDayRecord, where: string) =>
	new DomainError(404, `${labels[kind]} is not in this ${where}. Reload the page.`);

/** 404 unless the record is part of this episode of this channel. */
export async function assertInEpisode(
	channelId: string,
	episodeId: string,
	kind: EpisodeRecord,
	id: string
): Promise<void> {
	if (!isUuid(id) || !isUuid(episodeId)) throw notHere(kind, 'episode');
	const found = await sql<{ found: number }>`
		SELECT 1 AS found FROM episode e
		WHERE e.id = ${episodeId} AND e.channel_id = ${channelId} AND EXISTS (${
			kind === 'segment'
				? sql`SELECT 1 FROM segment s WHERE s.id = ${id} AND s.episode_id = e.id`
				: kind === 'shot'
					? sql`SELECT 1 FROM shot sh JOIN segment s ON s.id = sh.segment_id WHERE sh.id = ${id} AND s.episode_id = e.id`
					: kind === 'take'
						? sql`SELECT 1 FROM take t JOIN shot sh ON sh.id = t.shot_id JOIN segment s ON s.id = sh.segment_id WHERE t.id = ${id} AND s.episode_id = e.id`
						: kind === 'note'
							? sql`SELECT 1 FROM segment_note n WHERE n.id = ${id} AND n.episode_id = e.id`
							: sql`SELECT 1 FROM footage f WHERE f.id = ${id} AND f.episode_id = e.id AND f.channel_id = e.channel_id`
		})`.execute(db);
	if (found.rows.length === 0) throw notHere(kind, 'episode');
}

const dayTables = { camera: 'shoot_day_camera', gear: 'gear_item', pull: 'pull_item' } as const;

/** 404 unless the camera, gear item or pull-list item is on this shoot day of this channel. */
export async function assertOnShootDay(
	channelId: string,
	shootDayId: string,
	kind: ShootDayRecord,
	id: string
): Promise<void> {
	if (!isUuid(id) || !isUuid(shootDayId)) throw notHere(kind, 'shoot day');
	const found = await sql<{ found: number }>`
		SELECT 1 AS found FROM ${sql.table(dayTables[kind])} item JOIN shoot_day d ON d.id = item.shoot_day_id
		WHERE item.id = ${id} AND d.id = ${shootDayId} AND d.channel_id = ${channelId}`.execute(db);
	if (found.rows.length === 0) throw notHere(kind, 'shoot day');
}
