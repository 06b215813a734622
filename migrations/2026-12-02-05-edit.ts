import { type Kysely, sql } from 'kysely';

/**
 * The edit: chapter markers on an episode's cut. A chapter's start is a whole frame count from the
 * start of the cut at the episode's frame rate; its end is the next chapter's start (or the cut's
 * end), so it is never stored. `part_id` names a featured part; it has no foreign key yet because
 * the link to parts lands with the parts work. Frozen in time: it imports no app code.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.createTable('chapter')
		.addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('episode_id', 'uuid', (c) =>
			c.notNull().references('episode.id').onDelete('cascade')
		)
		.addColumn('start_frame', 'integer', (c) => c.notNull().check(sql`start_frame >= 0`))
		.addColumn('title', 'text', (c) => c.notNull())
		.addColumn('url', 'text')
		.addColumn('part_id', 'uuid')
		.addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
		.addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
		.execute();
	// The export and the timeline read an episode's chapters in start order.
	await db.schema
		.createIndex('chapter_episode_start')
		.on('chapter')
		.columns(['episode_id', 'start_frame'])
		.execute();

	// A cut has a length; zero or negative would make every chapter "past the end".
	await sql`ALTER TABLE episode ADD CONSTRAINT episode_cut_duration_positive CHECK (cut_duration_frames IS NULL OR cut_duration_frames > 0)`.execute(
		db
	);
}

export async function down(db: Kysely<any>): Promise<void> {
	await sql`ALTER TABLE episode DROP CONSTRAINT IF EXISTS episode_cut_duration_positive`.execute(
		db
	);
	await db.schema.dropTable('chapter').ifExists().execute();
}
