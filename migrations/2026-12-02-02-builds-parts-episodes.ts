import { type Kysely, sql } from 'kysely';

/**
 * The records the demo channel starts with: project vehicles (builds), the parts catalogue,
 * and episodes with their stage, builds featured and crew assignments.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.createTable('build')
		.addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('channel_id', 'uuid', (c) =>
			c.notNull().references('channel.id').onDelete('cascade')
		)
		.addColumn('name', 'text', (c) => c.notNull())
		.addColumn('year', 'integer', (c) => c.notNull())
		.addColumn('vehicle_type', 'text', (c) => c.notNull())
		.addColumn('drivetrain', 'text', (c) => c.notNull())
		.addColumn('front_suspension', 'text', (c) => c.notNull())
		.addColumn('rear_suspension', 'text', (c) => c.notNull())
		.addColumn('front_lift_in', 'numeric(5, 2)', (c) => c.notNull().defaultTo(0))
		.addColumn('rear_lift_in', 'numeric(5, 2)', (c) => c.notNull().defaultTo(0))
		.addColumn('tyre_size', 'text', (c) => c.notNull())
		.addColumn('notes', 'text', (c) => c.notNull().defaultTo(''))
		.addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
		.addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
		.execute();
	await db.schema.createIndex('build_channel').on('build').column('channel_id').execute();

	await db.schema
		.createTable('part')
		.addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('channel_id', 'uuid', (c) =>
			c.notNull().references('channel.id').onDelete('cascade')
		)
		.addColumn('sku', 'text', (c) => c.notNull())
		.addColumn('name', 'text', (c) => c.notNull())
		.addColumn('category', 'text', (c) => c.notNull())
		.addColumn('brand', 'text', (c) => c.notNull())
		.addColumn('price_cents', 'integer', (c) => c.notNull().check(sql`price_cents >= 0`))
		.addColumn('currency', 'text', (c) => c.notNull().defaultTo('USD'))
		.addColumn('store_url', 'text', (c) => c.notNull())
		.addColumn('fitment_note', 'text', (c) => c.notNull().defaultTo(''))
		.addColumn('status', 'text', (c) =>
			c
				.notNull()
				.defaultTo('active')
				.check(sql`status IN ('active', 'discontinued', 'out_of_stock')`)
		)
		.addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
		.addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
		.addUniqueConstraint('part_channel_sku', ['channel_id', 'sku'])
		.execute();

	await db.schema
		.createTable('episode')
		.addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('channel_id', 'uuid', (c) =>
			c.notNull().references('channel.id').onDelete('cascade')
		)
		.addColumn('title', 'text', (c) => c.notNull())
		.addColumn('slug', 'text', (c) => c.notNull())
		.addColumn('logline', 'text', (c) => c.notNull().defaultTo(''))
		.addColumn('target_runtime_seconds', 'integer', (c) =>
			c.notNull().check(sql`target_runtime_seconds > 0`)
		)
		.addColumn('frame_rate', 'text', (c) => c.notNull())
		.addColumn('publish_date', 'date')
		.addColumn('stage', 'text', (c) =>
			c
				.notNull()
				.defaultTo('script')
				.check(sql`stage IN ('script', 'shoot', 'edit', 'locked', 'published')`)
		)
		.addColumn('cut_duration_frames', 'integer')
		.addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
		.addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
		.addUniqueConstraint('episode_channel_slug', ['channel_id', 'slug'])
		.execute();

	await db.schema
		.createTable('episode_build')
		.addColumn('episode_id', 'uuid', (c) =>
			c.notNull().references('episode.id').onDelete('cascade')
		)
		.addColumn('build_id', 'uuid', (c) => c.notNull().references('build.id').onDelete('cascade'))
		.addPrimaryKeyConstraint('episode_build_pk', ['episode_id', 'build_id'])
		.execute();

	await db.schema
		.createTable('episode_assignment')
		.addColumn('episode_id', 'uuid', (c) =>
			c.notNull().references('episode.id').onDelete('cascade')
		)
		.addColumn('role', 'text', (c) => c.notNull())
		.addColumn('person_id', 'uuid', (c) => c.notNull().references('person.id').onDelete('cascade'))
		.addPrimaryKeyConstraint('episode_assignment_pk', ['episode_id', 'role'])
		.execute();
	await db.schema
		.createIndex('episode_assignment_person')
		.on('episode_assignment')
		.column('person_id')
		.execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	for (const table of ['episode_assignment', 'episode_build', 'episode', 'part', 'build']) {
		await db.schema.dropTable(table).ifExists().execute();
	}
}
