import { type Kysely, sql } from 'kysely';

/**
 * Chapters are read in (start_frame, created_at, id) order (exports, the edit page): an index in
 * that order lets a 10,000-chapter list come out of the index already sorted instead of being
 * sorted on every read. It replaces `chapter_episode_start` (episode_id, start_frame), whose reads
 * it serves as well. Frozen in time: it imports no app code.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await sql`CREATE INDEX chapter_episode_order ON chapter (episode_id, start_frame, created_at, id)`.execute(
		db
	);
	await db.schema.dropIndex('chapter_episode_start').ifExists().execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await sql`CREATE INDEX IF NOT EXISTS chapter_episode_start ON chapter (episode_id, start_frame)`.execute(
		db
	);
	await db.schema.dropIndex('chapter_episode_order').ifExists().execute();
}
