import { type Kysely, sql } from 'kysely';

/**
 * A channel that earns on the tracked links in its descriptions says so: the disclosure text the
 * publish kit places above the parts list and the publish gate asks for when the kit has links.
 * Empty until the producer writes it; at most 500 characters (the form's limit).
 * Frozen in time: it imports no app code.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.alterTable('channel')
		.addColumn('disclosure', 'text', (c) =>
			c
				.notNull()
				.defaultTo('')
				.check(sql`char_length(disclosure) <= 500`)
		)
		.execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.alterTable('channel').dropColumn('disclosure').execute();
}
