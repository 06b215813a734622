import { type Kysely, sql } from 'kysely';

/**
 * The shoot: shoot days with their location, times, crew called, builds on set, cameras with
 * recording profiles, gear and the parts pull list; resumable uploads and the footage they become.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.createTable('recording_profile')
		.addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('channel_id', 'uuid', (c) =>
			c.notNull().references('channel.id').onDelete('cascade')
		)
		.addColumn('name', 'text', (c) => c.notNull())
		.addColumn('camera', 'text', (c) => c.notNull())
		.addColumn('codec', 'text', (c) => c.notNull())
		.addColumn('resolution', 'text', (c) => c.notNull())
		.addColumn('frame_rate', 'text', (c) => c.notNull())
		.addColumn('bitrate_mbps', 'numeric(8, 2)', (c) => c.notNull().check(sql`bitrate_mbps > 0`))
		.addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
		.addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
		.execute();

	await db.schema
		.createTable('shoot_day')
		.addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('channel_id', 'uuid', (c) =>
			c.notNull().references('channel.id').onDelete('cascade')
		)
		.addColumn('episode_id', 'uuid', (c) =>
			c.notNull().references('episode.id').onDelete('cascade')
		)
		.addColumn('shoot_date', 'date', (c) => c.notNull())
		.addColumn('location_name', 'text', (c) => c.notNull())
		.addColumn('location_address', 'text', (c) => c.notNull().defaultTo(''))
		.addColumn('bay', 'text', (c) => c.notNull().defaultTo(''))
		.addColumn('bay_from', 'time')
		.addColumn('bay_until', 'time')
		.addColumn('call_time', 'time', (c) => c.notNull())
		.addColumn('wrap_time', 'time', (c) => c.notNull())
		.addColumn('program_minutes', 'numeric(6, 1)', (c) => c.notNull().defaultTo(12))
		.addColumn('shooting_ratio', 'numeric(6, 1)', (c) => c.notNull().defaultTo(10))
		.addColumn('card_size_gb', 'numeric(8, 1)', (c) => c.notNull().defaultTo(256))
		.addColumn('uplink_mbps', 'numeric(8, 1)', (c) => c.notNull().defaultTo(100))
		.addColumn('notes', 'text', (c) => c.notNull().defaultTo(''))
		.addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
		.addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
		.execute();
	await db.schema
		.createIndex('shoot_day_channel_date')
		.on('shoot_day')
		.columns(['channel_id', 'shoot_date'])
		.execute();

	await db.schema
		.createTable('shoot_day_crew')
		.addColumn('shoot_day_id', 'uuid', (c) =>
			c.notNull().references('shoot_day.id').onDelete('cascade')
		)
		.addColumn('person_id', 'uuid', (c) => c.notNull().references('person.id').onDelete('cascade'))
		.addColumn('duty', 'text', (c) => c.notNull().defaultTo(''))
		.addPrimaryKeyConstraint('shoot_day_crew_pk', ['shoot_day_id', 'person_id'])
		.execute();

	await db.schema
		.createTable('shoot_day_build')
		.addColumn('shoot_day_id', 'uuid', (c) =>
			c.notNull().references('shoot_day.id').onDelete('cascade')
		)
		.addColumn('build_id', 'uuid', (c) => c.notNull().references('build.id').onDelete('cascade'))
		.addPrimaryKeyConstraint('shoot_day_build_pk', ['shoot_day_id', 'build_id'])
		.execute();

	await db.schema
		.createTable('shoot_day_camera')
		.addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('shoot_day_id', 'uuid', (c) =>
			c.notNull().references('shoot_day.id').onDelete('cascade')
		)
		.addColumn('label', 'text', (c) => c.notNull())
		.addColumn('profile_id', 'uuid', (c) => c.notNull().references('recording_profile.id'))
		.addColumn('roll_hours', 'numeric(6, 2)')
		.execute();

	await db.schema
		.createTable('gear_item')
		.addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('shoot_day_id', 'uuid', (c) =>
			c.notNull().references('shoot_day.id').onDelete('cascade')
		)
		.addColumn('kind', 'text', (c) =>
			c.notNull().check(sql`kind IN ('camera', 'audio', 'light', 'grip', 'other')`)
		)
		.addColumn('label', 'text', (c) => c.notNull())
		.addColumn('quantity', 'integer', (c) =>
			c
				.notNull()
				.defaultTo(1)
				.check(sql`quantity > 0`)
		)
		.execute();

	await db.schema
		.createTable('pull_item')
		.addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('shoot_day_id', 'uuid', (c) =>
			c.notNull().references('shoot_day.id').onDelete('cascade')
		)
		.addColumn('part_id', 'uuid', (c) => c.references('part.id').onDelete('set null'))
		.addColumn('label', 'text', (c) => c.notNull())
		.addColumn('quantity', 'integer', (c) =>
			c
				.notNull()
				.defaultTo(1)
				.check(sql`quantity > 0`)
		)
		.addColumn('source', 'text', (c) =>
			c
				.notNull()
				.defaultTo('extra')
				.check(sql`source IN ('segment', 'extra')`)
		)
		.addColumn('on_hand', 'boolean', (c) => c.notNull().defaultTo(false))
		.addColumn('checked_by', 'uuid', (c) => c.references('person.id').onDelete('set null'))
		.addColumn('checked_at', 'timestamptz')
		.addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
		.execute();

	await db.schema
		.createTable('upload')
		.addColumn('id', 'text', (c) => c.primaryKey())
		.addColumn('channel_id', 'uuid', (c) =>
			c.notNull().references('channel.id').onDelete('cascade')
		)
		.addColumn('person_id', 'uuid', (c) => c.notNull().references('person.id'))
		.addColumn('episode_id', 'uuid', (c) =>
			c.notNull().references('episode.id').onDelete('cascade')
		)
		.addColumn('shoot_day_id', 'uuid', (c) => c.references('shoot_day.id').onDelete('set null'))
		.addColumn('purpose', 'text', (c) => c.notNull().check(sql`purpose IN ('footage', 'cut')`))
		.addColumn('camera_label', 'text', (c) => c.notNull().defaultTo(''))
		.addColumn('clip_name', 'text', (c) => c.notNull())
		.addColumn('file_name', 'text', (c) => c.notNull())
		.addColumn('file_type', 'text', (c) => c.notNull())
		.addColumn('size_bytes', 'bigint', (c) => c.notNull())
		.addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
		.addColumn('completed_at', 'timestamptz')
		.execute();

	await db.schema
		.createTable('footage')
		.addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('channel_id', 'uuid', (c) =>
			c.notNull().references('channel.id').onDelete('cascade')
		)
		.addColumn('episode_id', 'uuid', (c) =>
			c.notNull().references('episode.id').onDelete('cascade')
		)
		.addColumn('shoot_day_id', 'uuid', (c) => c.references('shoot_day.id').onDelete('set null'))
		.addColumn('upload_id', 'text', (c) => c.notNull().unique())
		.addColumn('purpose', 'text', (c) => c.notNull().check(sql`purpose IN ('footage', 'cut')`))
		.addColumn('camera_label', 'text', (c) => c.notNull().defaultTo(''))
		.addColumn('clip_name', 'text', (c) => c.notNull())
		.addColumn('file_name', 'text', (c) => c.notNull())
		.addColumn('file_type', 'text', (c) => c.notNull())
		.addColumn('size_bytes', 'bigint', (c) => c.notNull())
		.addColumn('sha256', 'text', (c) => c.notNull())
		.addColumn('duration_seconds', 'double precision')
		.addColumn('frame_rate', 'text')
		.addColumn('video_codec', 'text')
		.addColumn('probe_note', 'text')
		.addColumn('uploaded_by', 'uuid', (c) => c.references('person.id').onDelete('set null'))
		.addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
		.execute();
	await db.schema
		.createIndex('footage_episode')
		.on('footage')
		.columns(['episode_id', 'created_at'])
		.execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	for (const table of [
		'footage',
		'upload',
		'pull_item',
		'gear_item',
		'shoot_day_camera',
		'shoot_day_build',
		'shoot_day_crew',
		'shoot_day',
		'recording_profile'
	]) {
		await db.schema.dropTable(table).ifExists().execute();
	}
}
