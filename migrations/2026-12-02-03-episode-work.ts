import { type Kysely, sql } from 'kysely';

/**
 * Episode work: the rundown (ordered segments with hazard flags), one Markdown script per segment,
 * the caution card of each flagged hazard with its place in the cut, the shot list and takes the
 * stage gates read (the shoot work extends them), the stage history, and script reviews.
 * Also the script-approval columns on episode and the spring types and lift methods on build.
 * Frozen in time: it imports no app code, so the lists below are copied, not imported.
 */
const SEGMENT_KINDS = [
	'cold-open',
	'overview',
	'parts-bench',
	'install-step',
	'wheels-tyres',
	'test-drive',
	'tips',
	'call-to-action',
	'teaser'
];
const HAZARDS = [
	'raised-vehicle',
	'compressed-springs',
	'heat-torch',
	'cutting-grinding',
	'brakes',
	'steering',
	'airbags-electrical'
];
const SPRING_TYPES = ['leaf', 'coil', 'torsion', 'strut'];

const textList = (values: string[]) => sql.raw(values.map((value) => `'${value}'`).join(', '));

export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.alterTable('episode')
		.addColumn('script_status', 'text', (c) =>
			c
				.notNull()
				.defaultTo('draft')
				.check(sql`script_status IN ('draft', 'submitted', 'approved', 'returned')`)
		)
		.addColumn('script_approved_fingerprint', 'text')
		.addColumn('script_approved_at', 'timestamptz')
		.addColumn('script_approved_by', 'uuid', (c) => c.references('person.id').onDelete('set null'))
		.execute();

	await db.schema
		.alterTable('build')
		.addColumn('front_spring', 'text', (c) =>
			c.check(sql`front_spring IN (${textList(SPRING_TYPES)})`)
		)
		.addColumn('rear_spring', 'text', (c) =>
			c.check(sql`rear_spring IN (${textList(SPRING_TYPES)})`)
		)
		.addColumn('front_lift_method', 'text')
		.addColumn('rear_lift_method', 'text')
		.execute();

	await db.schema
		.createTable('segment')
		.addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('episode_id', 'uuid', (c) =>
			c.notNull().references('episode.id').onDelete('cascade')
		)
		.addColumn('position', 'integer', (c) => c.notNull().check(sql`position >= 1`))
		.addColumn('kind', 'text', (c) => c.notNull().check(sql`kind IN (${textList(SEGMENT_KINDS)})`))
		.addColumn('title', 'text', (c) => c.notNull())
		.addColumn('planned_seconds', 'integer', (c) =>
			c
				.notNull()
				.defaultTo(0)
				.check(sql`planned_seconds BETWEEN 0 AND 36000`)
		)
		.addColumn('build_id', 'uuid', (c) => c.references('build.id').onDelete('set null'))
		.addColumn('needs_footage', 'boolean', (c) => c.notNull().defaultTo(true))
		.addColumn('hazards', sql`text[]`, (c) =>
			c
				.notNull()
				.defaultTo(sql`'{}'::text[]`)
				.check(sql`hazards <@ ARRAY[${textList(HAZARDS)}]::text[]`)
		)
		// Length of this segment in the cut, set by the editor; calibrates the host's pace.
		.addColumn('recorded_frames', 'integer', (c) => c.check(sql`recorded_frames >= 0`))
		// A teaser may promise a future episode: a real one, or a placeholder title until it exists.
		.addColumn('promise_episode_id', 'uuid', (c) => c.references('episode.id').onDelete('set null'))
		.addColumn('promise_title', 'text')
		.addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
		.addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
		.addColumn('updated_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
		.execute();
	// Deferred so a reorder can move every position inside one transaction.
	await sql`ALTER TABLE segment ADD CONSTRAINT segment_episode_position UNIQUE (episode_id, position) DEFERRABLE INITIALLY DEFERRED`.execute(
		db
	);
	await db.schema
		.createIndex('segment_promise_episode')
		.on('segment')
		.column('promise_episode_id')
		.execute();

	await db.schema
		.createTable('segment_script')
		.addColumn('segment_id', 'uuid', (c) =>
			c.primaryKey().references('segment.id').onDelete('cascade')
		)
		.addColumn('body', 'text', (c) =>
			c
				.notNull()
				.defaultTo('')
				.check(sql`char_length(body) <= 100000`)
		)
		.addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
		.addColumn('updated_by', 'uuid', (c) => c.references('person.id').onDelete('set null'))
		.addColumn('updated_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
		.execute();

	await db.schema
		.createTable('caution')
		.addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('segment_id', 'uuid', (c) =>
			c.notNull().references('segment.id').onDelete('cascade')
		)
		.addColumn('hazard', 'text', (c) => c.notNull().check(sql`hazard IN (${textList(HAZARDS)})`))
		.addColumn('text', 'text', (c) => c.notNull().check(sql`char_length(text) <= 140`))
		// Frame in the cut (episode frame rate) where the caution card appears; null = not placed yet.
		.addColumn('at_frame', 'integer', (c) => c.check(sql`at_frame >= 0`))
		.addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
		.addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
		.addColumn('updated_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
		.addUniqueConstraint('caution_segment_hazard', ['segment_id', 'hazard'])
		.execute();

	await db.schema
		.createTable('shot')
		.addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('segment_id', 'uuid', (c) =>
			c.notNull().references('segment.id').onDelete('cascade')
		)
		.addColumn('what', 'text', (c) => c.notNull())
		.addColumn('angle', 'text', (c) => c.notNull().defaultTo(''))
		.addColumn('roll', 'text', (c) =>
			c
				.notNull()
				.defaultTo('A')
				.check(sql`roll IN ('A', 'B')`)
		)
		.addColumn('camera', 'text', (c) => c.notNull().defaultTo(''))
		.addColumn('notes', 'text', (c) => c.notNull().defaultTo(''))
		.addColumn('position', 'integer', (c) => c.notNull())
		.addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
		.addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
		.execute();
	await db.schema
		.createIndex('shot_segment')
		.on('shot')
		.columns(['segment_id', 'position'])
		.execute();

	await db.schema
		.createTable('take')
		.addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('shot_id', 'uuid', (c) => c.notNull().references('shot.id').onDelete('cascade'))
		.addColumn('clip_name', 'text', (c) => c.notNull())
		.addColumn('source_in_frames', 'integer', (c) => c.notNull().check(sql`source_in_frames >= 0`))
		.addColumn('source_out_frames', 'integer', (c) => c.notNull())
		.addColumn('good', 'boolean', (c) => c.notNull().defaultTo(false))
		.addColumn('note', 'text', (c) => c.notNull().defaultTo(''))
		// The uploaded footage of this take; the shoot work adds the footage table and its foreign key.
		.addColumn('footage_id', 'uuid')
		.addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
		.addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
		.addCheckConstraint('take_out_after_in', sql`source_out_frames >= source_in_frames`)
		.execute();
	await db.schema.createIndex('take_shot').on('take').column('shot_id').execute();

	await db.schema
		.createTable('stage_move')
		.addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('episode_id', 'uuid', (c) =>
			c.notNull().references('episode.id').onDelete('cascade')
		)
		.addColumn('person_id', 'uuid', (c) => c.references('person.id').onDelete('set null'))
		// Null for the row written when the episode is created.
		.addColumn('from_stage', 'text')
		.addColumn('to_stage', 'text', (c) => c.notNull())
		.addColumn('note', 'text', (c) => c.notNull().defaultTo(''))
		.addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
		.execute();
	await db.schema
		.createIndex('stage_move_episode')
		.on('stage_move')
		.columns(['episode_id', 'created_at'])
		.execute();

	await db.schema
		.createTable('script_review')
		.addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('episode_id', 'uuid', (c) =>
			c.notNull().references('episode.id').onDelete('cascade')
		)
		.addColumn('segment_id', 'uuid', (c) => c.references('segment.id').onDelete('cascade'))
		.addColumn('person_id', 'uuid', (c) => c.references('person.id').onDelete('set null'))
		.addColumn('kind', 'text', (c) =>
			c.notNull().check(sql`kind IN ('submitted', 'approved', 'returned', 'comment')`)
		)
		.addColumn('body', 'text', (c) =>
			c
				.notNull()
				.defaultTo('')
				.check(sql`char_length(body) <= 4000`)
		)
		// Fingerprint of the script text the reviewer saw.
		.addColumn('fingerprint', 'text')
		.addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
		.execute();
	await db.schema
		.createIndex('script_review_episode')
		.on('script_review')
		.columns(['episode_id', 'created_at'])
		.execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	for (const table of [
		'script_review',
		'stage_move',
		'take',
		'shot',
		'caution',
		'segment_script',
		'segment'
	]) {
		await db.schema.dropTable(table).ifExists().execute();
	}
	await db.schema
		.alterTable('build')
		.dropColumn('front_spring')
		.dropColumn('rear_spring')
		.dropColumn('front_lift_method')
		.dropColumn('rear_lift_method')
		.execute();
	await db.schema
		.alterTable('episode')
		.dropColumn('script_status')
		.dropColumn('script_approved_fingerprint')
		.dropColumn('script_approved_at')
		.dropColumn('script_approved_by')
		.execute();
}
