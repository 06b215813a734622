import { type Kysely, sql } from 'kysely';

/**
 * Indexes for the lists paged in this step, each in the exact order its keyset reads:
 *
 * - `footage_episode_<sort>`: an episode's footage by upload time, clip name, camera, size or
 *   length (no length sorts as -1), then id. A page in either direction reads one index range from
 *   the cursor (backwards for descending), so a deep page costs what the first does.
 * - `segment_note_episode_program`: an episode's notes by program frame (unplaced last), when they
 *   were written and id; the segment position between them is sorted within a run of equal frames.
 *
 * The crew is ordered by the person's name, a column of another table than the one filtered by
 * channel, so no single index serves it; a channel's crew is small.
 * Frozen in time: it imports no app code.
 */
const FOOTAGE_SORTS: [string, string][] = [
	['footage_episode_created', 'created_at'],
	['footage_episode_clip', 'clip_name'],
	['footage_episode_camera', 'camera_label'],
	['footage_episode_size', 'size_bytes'],
	['footage_episode_duration', '(coalesce(duration_seconds, -1))']
];

export async function up(db: Kysely<any>): Promise<void> {
	for (const [name, key] of FOOTAGE_SORTS)
		await sql`CREATE INDEX ${sql.ref(name)} ON footage (episode_id, ${sql.raw(key)}, id)`.execute(
			db
		);
	await sql`CREATE INDEX segment_note_episode_program ON segment_note (episode_id, (coalesce(program_frame, 2147483647)), created_at, id)`.execute(
		db
	);
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.dropIndex('segment_note_episode_program').ifExists().execute();
	for (const [name] of FOOTAGE_SORTS) await db.schema.dropIndex(name).ifExists().execute();
}
