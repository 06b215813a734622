import { type Kysely, sql } from 'kysely';

/**
 * Spec cards: the computed numbers an episode puts on screen (tyre, tyre change, torque, lift, free
 * text). `input` is the card as the editor entered it (validated by the app before it is stored);
 * the lines on screen are worked out from it every time they are read, so a card never carries a
 * stale figure. `at_frame` and `duration_frames` are whole frames of the cut at the episode's frame
 * rate; `at_frame` null means "not placed in the cut yet". Frozen in time: it imports no app code,
 * so the list of kinds is copied, not imported.
 */
const KINDS = ['tyre', 'tyre-change', 'torque', 'lift', 'text'];

const textList = (values: string[]) => sql.raw(values.map((value) => `'${value}'`).join(', '));

export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.createTable('spec_card')
		.addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('episode_id', 'uuid', (c) =>
			c.notNull().references('episode.id').onDelete('cascade')
		)
		// A card outlives its segment being cut from the rundown: it just stops naming one.
		.addColumn('segment_id', 'uuid', (c) => c.references('segment.id').onDelete('set null'))
		.addColumn('kind', 'text', (c) => c.notNull().check(sql`kind IN (${textList(KINDS)})`))
		.addColumn('input', 'jsonb', (c) => c.notNull())
		.addColumn('at_frame', 'integer', (c) => c.check(sql`at_frame >= 0`))
		.addColumn('duration_frames', 'integer', (c) => c.check(sql`duration_frames > 0`))
		.addColumn('position', 'integer', (c) => c.notNull().check(sql`position >= 1`))
		.addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
		.addColumn('created_by', 'uuid', (c) => c.references('person.id').onDelete('set null'))
		.addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
		.addColumn('updated_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
		// The stored card must say the same kind as the column the list filters and sorts on.
		.addCheckConstraint('spec_card_input_kind', sql`input->>'kind' = kind`)
		.execute();
	// The page, the export and the timeline read an episode's cards in program-time order.
	await db.schema
		.createIndex('spec_card_episode_at')
		.on('spec_card')
		.columns(['episode_id', 'at_frame', 'position'])
		.execute();
	await db.schema.createIndex('spec_card_segment').on('spec_card').column('segment_id').execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.dropTable('spec_card').ifExists().execute();
}
