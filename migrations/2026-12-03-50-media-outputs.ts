import { sql, type Kysely } from 'kysely';

/**
 * What the media worker makes from each finished upload, and what a fuller probe reads.
 *
 * - `footage` gains the probe's facts: codec profile, pixel format, whether the frame rate is
 *   variable, picture size, the start timecode the camera wrote, audio channels and bit rate.
 * - `media_output` holds one row per footage and kind (proxy, poster, sprite, peaks): its state,
 *   progress (0–1), where the file is, and a heartbeat the running worker refreshes, so another
 *   worker can take over a job whose worker died (kill -9) without waiting for the queue's expiry.
 *   The jobs themselves live in pg-boss's own schema (`pgboss`), created when it first starts.
 *
 * Frozen in time: it imports no app code.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.alterTable('footage')
		.addColumn('video_profile', 'text')
		.addColumn('pixel_format', 'text')
		.addColumn('variable_frame_rate', 'boolean')
		.addColumn('width', 'integer')
		.addColumn('height', 'integer')
		.addColumn('start_timecode', 'text')
		.addColumn('audio_channels', 'integer')
		.addColumn('bit_rate', 'bigint')
		.execute();
	await db.schema
		.createTable('media_output')
		.addColumn('footage_id', 'uuid', (c) =>
			c.notNull().references('footage.id').onDelete('cascade')
		)
		.addColumn('kind', 'text', (c) =>
			c.notNull().check(sql`kind IN ('proxy', 'poster', 'sprite', 'peaks')`)
		)
		.addColumn('state', 'text', (c) =>
			c
				.notNull()
				.defaultTo('waiting')
				.check(sql`state IN ('waiting', 'working', 'done', 'failed', 'skipped')`)
		)
		.addColumn('progress', 'real', (c) =>
			c
				.notNull()
				.defaultTo(0)
				.check(sql`progress >= 0 AND progress <= 1`)
		)
		.addColumn('job_id', 'uuid')
		.addColumn('attempts', 'integer', (c) => c.notNull().defaultTo(0))
		.addColumn('storage_key', 'text')
		.addColumn('bytes', 'bigint')
		.addColumn('details', 'jsonb')
		.addColumn('message', 'text')
		.addColumn('heartbeat_at', 'timestamptz')
		.addColumn('updated_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
		.addPrimaryKeyConstraint('media_output_pk', ['footage_id', 'kind'])
		.execute();
	await sql`CREATE INDEX media_output_working ON media_output (heartbeat_at) WHERE state = 'working'`.execute(
		db
	);
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.dropTable('media_output').execute();
	await db.schema
		.alterTable('footage')
		.dropColumn('video_profile')
		.dropColumn('pixel_format')
		.dropColumn('variable_frame_rate')
		.dropColumn('width')
		.dropColumn('height')
		.dropColumn('start_timecode')
		.dropColumn('audio_channels')
		.dropColumn('bit_rate')
		.execute();
	await sql`DROP SCHEMA IF EXISTS pgboss CASCADE`.execute(db);
}
