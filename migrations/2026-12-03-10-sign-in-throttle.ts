import { type Kysely, sql } from 'kysely';

/**
 * Sign-in and reset throttling: one counter row per key (a hashed e-mail address or client, or an
 * unlock grant) with its hits in the current fixed window, updated by one atomic upsert. Replaces
 * sign_in_failure, whose count-then-insert let concurrent guesses through. One-time links gain the
 * purpose 'unlock' (a mailed link that lets the owner sign in past the limits), and an index on
 * person_id for voiding a person's older links.
 * Frozen in time: it imports no app code.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.createTable('throttle_counter')
		.addColumn('key', 'text', (c) => c.primaryKey())
		.addColumn('hits', 'integer', (c) => c.notNull().check(sql`hits >= 0`))
		.addColumn('window_ends_at', 'timestamptz', (c) => c.notNull())
		.execute();
	await db.schema
		.createIndex('throttle_counter_window_ends_at')
		.on('throttle_counter')
		.column('window_ends_at')
		.execute();

	await sql`ALTER TABLE one_time_link DROP CONSTRAINT one_time_link_purpose_check`.execute(db);
	await sql`ALTER TABLE one_time_link ADD CONSTRAINT one_time_link_purpose_check
		CHECK (purpose IN ('invite', 'reset', 'unlock'))`.execute(db);
	await db.schema
		.createIndex('one_time_link_person')
		.on('one_time_link')
		.columns(['person_id', 'purpose'])
		.execute();

	await db.schema.dropTable('sign_in_failure').execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema
		.createTable('sign_in_failure')
		.addColumn('id', 'bigserial', (c) => c.primaryKey())
		.addColumn('email_key', 'text', (c) => c.notNull())
		.addColumn('at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
		.execute();
	await db.schema
		.createIndex('sign_in_failure_key_at')
		.on('sign_in_failure')
		.columns(['email_key', 'at'])
		.execute();
	await db.schema.dropIndex('one_time_link_person').execute();
	await sql`DELETE FROM one_time_link WHERE purpose = 'unlock'`.execute(db);
	await sql`ALTER TABLE one_time_link DROP CONSTRAINT one_time_link_purpose_check`.execute(db);
	await sql`ALTER TABLE one_time_link ADD CONSTRAINT one_time_link_purpose_check
		CHECK (purpose IN ('invite', 'reset'))`.execute(db);
	await db.schema.dropTable('throttle_counter').execute();
}
