import { type Kysely, sql } from 'kysely';

/**
 * One index per order of the episode list (src/lib/server/episodes/episode-list.ts), scoped by
 * channel, holding every sort key in the list's own direction, so each first page (and each page
 * after a cursor) reads its 51 rows from an index instead of reading and sorting every episode of
 * the channel. At 10,000 episodes a first page sorted by title, stage or creation time read all
 * 10,000 rows and sorted them (about 14–25 ms by EXPLAIN ANALYZE); publish date going down read
 * the 2,000 undated ones and sorted them. The default order (publish date going up) already has
 * `episode_channel_publish` (2026-12-03-40-paging-indexes).
 *
 * The tail keys (title, id) always go up, whatever the chosen direction, so a direction going down
 * needs an index of its own rather than the other one read backwards. Each expression must stay
 * exactly the list's sort key (the stage's position in the production line included), or the
 * planner cannot use the index. Frozen in time: it imports no app code.
 */
const STAGE_POSITION = sql`array_position(ARRAY['script', 'shoot', 'edit', 'locked', 'published']::text[], stage)`;
const PUBLISH_KEY = sql`coalesce(publish_date, 'infinity'::date)`;

const INDEXES = [
	['episode_list_publish_desc', sql`channel_id, ${PUBLISH_KEY} DESC, title, id`],
	['episode_list_title', sql`channel_id, lower(title), title, id`],
	['episode_list_title_desc', sql`channel_id, lower(title) DESC, title, id`],
	['episode_list_stage', sql`channel_id, ${STAGE_POSITION}, ${PUBLISH_KEY}, title, id`],
	['episode_list_stage_desc', sql`channel_id, ${STAGE_POSITION} DESC, ${PUBLISH_KEY}, title, id`],
	['episode_list_created', sql`channel_id, created_at, title, id`],
	['episode_list_created_desc', sql`channel_id, created_at DESC, title, id`]
] as const;

export async function up(db: Kysely<any>): Promise<void> {
	for (const [name, keys] of INDEXES)
		await sql`CREATE INDEX ${sql.ref(name)} ON episode (${keys})`.execute(db);
}

export async function down(db: Kysely<any>): Promise<void> {
	for (const [name] of [...INDEXES].reverse()) await db.schema.dropIndex(name).ifExists().execute();
}
