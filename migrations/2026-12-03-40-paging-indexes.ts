import { type Kysely, sql } from 'kysely';

/**
 * Indexes for lists at a real channel's size (keyset pages, the catalogue, the episode picker).
 *
 * - `part_channel_category_name`: a category filter sorted by name reads one index range in order
 *   instead of sorting every part of the category.
 * - `part_channel_lower_sku`, `part_channel_lower_name`: "named in the script" looks the script's
 *   phrases up in these, instead of computing lower() over the whole catalogue.
 * - The trigram index on `search_text` now leads with `channel_id` (btree_gin), so a search reads
 *   only the channel's own entries.
 * - `episode_channel_publish`: the episode list's default order (publish date, no date last, then
 *   title and id) read from the index; `episode_title_trgm` answers the picker's title search.
 * Frozen in time: it imports no app code.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await sql`CREATE EXTENSION IF NOT EXISTS btree_gin`.execute(db);
	await sql`CREATE INDEX part_channel_category_name ON part (channel_id, category, name, sku)`.execute(
		db
	);
	await sql`CREATE INDEX part_channel_lower_sku ON part (channel_id, lower(sku))`.execute(db);
	await sql`CREATE INDEX part_channel_lower_name ON part (channel_id, lower(name))`.execute(db);
	await sql`CREATE INDEX part_channel_search_trgm ON part USING gin (channel_id, search_text gin_trgm_ops)`.execute(
		db
	);
	await sql`DROP INDEX IF EXISTS part_search_trgm`.execute(db);
	await sql`CREATE INDEX episode_channel_publish ON episode (channel_id, coalesce(publish_date, 'infinity'::date), title, id)`.execute(
		db
	);
	await sql`CREATE INDEX episode_title_trgm ON episode USING gin (lower(title) gin_trgm_ops)`.execute(
		db
	);
}

export async function down(db: Kysely<any>): Promise<void> {
	await sql`CREATE INDEX IF NOT EXISTS part_search_trgm ON part USING gin (search_text gin_trgm_ops)`.execute(
		db
	);
	for (const index of [
		'episode_title_trgm',
		'episode_channel_publish',
		'part_channel_search_trgm',
		'part_channel_lower_name',
		'part_channel_lower_sku',
		'part_channel_category_name'
	])
		await db.schema.dropIndex(index).ifExists().execute();
	// btree_gin stays: other objects may use it, and it costs nothing unused.
}
