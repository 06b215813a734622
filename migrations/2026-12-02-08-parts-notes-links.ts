import { type Kysely, sql } from 'kysely';

/**
 * Featured parts: timestamped segment notes and the catalogue parts they show, tracked links per
 * episode and part with their clicks per day, and the indexes the catalogue search reads.
 *
 * - `segment_note.program_frame` is a frame of the cut at the episode's rate (null until the
 *   editor places it); `source_frame` is a frame of the take's camera timecode at the same rate.
 * - `tracked_link.code` is the short random code in /go/[code]; one link per episode and part.
 * - `link_click_day` keeps only a count per link and day: no address, no browser, no person.
 * - Search: a stored, lower-cased `search_text` (SKU, name and brand) with a pg_trgm trigram GIN
 *   index, so `search_text LIKE lower('%word%')` is answered from the index. A plain LIKE on
 *   lower-cased text is also several times cheaper per row than ILIKE under a UTF-8 locale, which
 *   matters when a common word matches thousands of parts. Btree indexes serve the sorted pages.
 * Frozen in time: it imports no app code.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await sql`CREATE EXTENSION IF NOT EXISTS pg_trgm`.execute(db);
	await sql`ALTER TABLE part ADD COLUMN search_text text GENERATED ALWAYS AS (lower(sku || ' ' || name || ' ' || brand)) STORED`.execute(
		db
	);
	await sql`CREATE INDEX part_search_trgm ON part USING gin (search_text gin_trgm_ops)`.execute(db);
	await db.schema
		.createIndex('part_channel_name')
		.on('part')
		.columns(['channel_id', 'name'])
		.execute();
	await db.schema
		.createIndex('part_channel_brand')
		.on('part')
		.columns(['channel_id', 'brand', 'sku'])
		.execute();
	await db.schema
		.createIndex('part_channel_category')
		.on('part')
		.columns(['channel_id', 'category', 'sku'])
		.execute();
	await db.schema
		.createIndex('part_channel_price')
		.on('part')
		.columns(['channel_id', 'price_cents', 'sku'])
		.execute();

	await db.schema
		.createTable('segment_note')
		.addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('episode_id', 'uuid', (c) =>
			c.notNull().references('episode.id').onDelete('cascade')
		)
		.addColumn('segment_id', 'uuid', (c) => c.references('segment.id').onDelete('set null'))
		.addColumn('program_frame', 'integer', (c) => c.check(sql`program_frame >= 0`))
		.addColumn('take_id', 'uuid', (c) => c.references('take.id').onDelete('set null'))
		.addColumn('source_frame', 'integer', (c) => c.check(sql`source_frame >= 0`))
		.addColumn('text', 'text', (c) => c.notNull().check(sql`char_length(text) BETWEEN 1 AND 2000`))
		.addColumn('author_id', 'uuid', (c) => c.references('person.id').onDelete('set null'))
		.addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
		.addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
		.addColumn('updated_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
		.execute();
	// The notes page and the featured parts list read an episode's notes in program-time order.
	await db.schema
		.createIndex('segment_note_episode_frame')
		.on('segment_note')
		.columns(['episode_id', 'program_frame'])
		.execute();
	await db.schema.createIndex('segment_note_take').on('segment_note').column('take_id').execute();

	await db.schema
		.createTable('segment_note_part')
		.addColumn('note_id', 'uuid', (c) =>
			c.notNull().references('segment_note.id').onDelete('cascade')
		)
		// A part on a note can't be deleted from the catalogue; it is retired (discontinued) instead.
		.addColumn('part_id', 'uuid', (c) => c.notNull().references('part.id').onDelete('restrict'))
		.addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
		.addPrimaryKeyConstraint('segment_note_part_pk', ['note_id', 'part_id'])
		.execute();
	await db.schema
		.createIndex('segment_note_part_part')
		.on('segment_note_part')
		.column('part_id')
		.execute();

	await db.schema
		.createTable('tracked_link')
		.addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('code', 'text', (c) =>
			c
				.notNull()
				.unique()
				.check(sql`code ~ '^[A-Za-z0-9]{6,16}$'`)
		)
		.addColumn('episode_id', 'uuid', (c) =>
			c.notNull().references('episode.id').onDelete('cascade')
		)
		.addColumn('part_id', 'uuid', (c) => c.notNull().references('part.id').onDelete('restrict'))
		.addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
		.addUniqueConstraint('tracked_link_episode_part', ['episode_id', 'part_id'])
		.execute();
	await db.schema.createIndex('tracked_link_part').on('tracked_link').column('part_id').execute();

	await db.schema
		.createTable('link_click_day')
		.addColumn('link_id', 'uuid', (c) =>
			c.notNull().references('tracked_link.id').onDelete('cascade')
		)
		.addColumn('day', 'date', (c) => c.notNull())
		.addColumn('clicks', 'integer', (c) =>
			c
				.notNull()
				.defaultTo(0)
				.check(sql`clicks >= 0`)
		)
		.addPrimaryKeyConstraint('link_click_day_pk', ['link_id', 'day'])
		.execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	for (const table of ['link_click_day', 'tracked_link', 'segment_note_part', 'segment_note']) {
		await db.schema.dropTable(table).ifExists().execute();
	}
	for (const index of [
		'part_channel_price',
		'part_channel_category',
		'part_channel_brand',
		'part_channel_name',
		'part_search_trgm'
	]) {
		await db.schema.dropIndex(index).ifExists().execute();
	}
	await sql`ALTER TABLE part DROP COLUMN IF EXISTS search_text`.execute(db);
	// pg_trgm stays: other objects may use it, and it costs nothing unused.
}
