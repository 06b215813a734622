import { sql, type Kysely } from 'kysely';

/**
 * A host's speaking pace, from a timed reading of a sample paragraph aloud: one row per member of a
 * channel (a host may read for themselves; a producer may record it for the channel's hosts). The
 * words and milliseconds are kept, not only the pace, so the figure can be re-derived. The check
 * keeps the pace inside 80–260 words a minute, the range the app accepts as a speaking pace.
 * Frozen in time: it imports no app code.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.createTable('speaking_pace')
		.addColumn('channel_id', 'uuid', (c) => c.notNull())
		.addColumn('person_id', 'uuid', (c) => c.notNull())
		.addColumn('words', 'integer', (c) => c.notNull())
		.addColumn('milliseconds', 'integer', (c) => c.notNull())
		.addColumn('recorded_by', 'uuid', (c) => c.references('person.id').onDelete('set null'))
		.addColumn('recorded_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
		.addPrimaryKeyConstraint('speaking_pace_pk', ['channel_id', 'person_id'])
		.addForeignKeyConstraint(
			'speaking_pace_membership',
			['channel_id', 'person_id'],
			'membership',
			['channel_id', 'person_id'],
			(c) => c.onDelete('cascade')
		)
		.addCheckConstraint('speaking_pace_words_positive', sql`words > 0`)
		.addCheckConstraint('speaking_pace_milliseconds_positive', sql`milliseconds > 0`)
		.addCheckConstraint(
			'speaking_pace_plausible',
			sql`words::numeric * 60000 BETWEEN 80 * milliseconds::numeric AND 260 * milliseconds::numeric`
		)
		.execute();
	await db.schema
		.createIndex('speaking_pace_recorded_by')
		.on('speaking_pace')
		.column('recorded_by')
		.execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.dropTable('speaking_pace').execute();
}
