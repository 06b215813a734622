/**
 * Fresh episodes of known sizes for the Storage view's tests, written straight into the test
 * database: footage rows (rushes and cuts), their made files (media_output), and uploads still
 * arriving. No file is stored; the view reads only the recorded sizes.
 */
import { randomUUID } from 'node:crypto';
import { sql } from './http';

export interface Clip {
	purpose: 'footage' | 'cut';
	bytes: number;
	made?: Partial<Record<'proxy' | 'poster' | 'sprite' | 'peaks', number | null>>;
}

export interface EpisodeRecipe {
	title: string;
	stage: 'script' | 'shoot' | 'edit' | 'locked' | 'published';
	clips: Clip[];
	/** Declared lengths of unfinished uploads; `finished` uploads are recorded as completed. */
	arriving?: number[];
	finished?: number[];
	/** Days ago the episode was moved to published (a stage_move row). */
	publishedDaysAgo?: number;
	/** Only a planned publish date, days ago, and no stage_move row. */
	publishDateDaysAgo?: number;
}

export async function channelOf(slug: string): Promise<string> {
	const [row] = await sql(`SELECT channel_id FROM episode WHERE slug = $1`, [slug]);
	return row.channel_id;
}

/** Writes one episode and its files; returns the episode's id. */
export async function storageEpisode(channelId: string, recipe: EpisodeRecipe): Promise<string> {
	const slug = `storage-test-${randomUUID()}`;
	const [episode] = await sql(
		`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate, stage, publish_date)
		 VALUES ($1, $2, $3, 600, '29.97', $4,
			CASE WHEN $5::int IS NULL THEN NULL ELSE current_date - $5::int END) RETURNING id`,
		[channelId, recipe.title, slug, recipe.stage, recipe.publishDateDaysAgo ?? null]
	);
	const [person] = await sql(
		`SELECT person_id FROM membership WHERE channel_id = $1 ORDER BY person_id LIMIT 1`,
		[channelId]
	);
	for (const [index, clip] of recipe.clips.entries()) {
		const [footage] = await sql(
			`INSERT INTO footage (channel_id, episode_id, upload_id, purpose, clip_name, file_name, file_type, size_bytes, sha256)
			 VALUES ($1, $2, $3, $4, $5, $5, 'video/mp4', $6, repeat('0', 64)) RETURNING id`,
			[channelId, episode.id, randomUUID(), clip.purpose, `clip-${index}.mp4`, clip.bytes]
		);
		for (const [kind, bytes] of Object.entries(clip.made ?? {}))
			await sql(
				`INSERT INTO media_output (footage_id, kind, state, bytes) VALUES ($1, $2, $3, $4)`,
				[footage.id, kind, bytes === null ? 'waiting' : 'done', bytes]
			);
	}
	for (const [list, completed] of [
		[recipe.arriving ?? [], false],
		[recipe.finished ?? [], true]
	] as const)
		for (const bytes of list)
			await sql(
				`INSERT INTO upload (id, channel_id, person_id, episode_id, purpose, clip_name, file_name, file_type, size_bytes, completed_at)
				 VALUES ($1, $2, $3, $4, 'footage', 'arriving.mp4', 'arriving.mp4', 'video/mp4', $5, $6)`,
				[
					randomUUID().replaceAll('-', ''),
					channelId,
					person.person_id,
					episode.id,
					bytes,
					completed ? new Date() : null
				]
			);
	if (recipe.publishedDaysAgo !== undefined)
		await sql(
			`INSERT INTO stage_move (episode_id, from_stage, to_stage, created_at)
			 VALUES ($1, 'locked', 'published', now() - make_interval(days => $2))`,
			[episode.id, recipe.publishedDaysAgo]
		);
	return episode.id;
}

export async function removeEpisodes(ids: string[]): Promise<void> {
	if (ids.length) {
		await sql(`DELETE FROM upload WHERE episode_id = ANY($1::uuid[])`, [ids]);
		await sql(`DELETE FROM episode WHERE id = ANY($1::uuid[])`, [ids]);
	}
}
