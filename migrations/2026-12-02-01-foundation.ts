import { type Kysely, sql } from 'kysely';

/**
 * Foundation: channels, people and their per-channel roles, sessions, one-time links
 * (invites and password resets), personal API tokens, and the mail outbox.
 * Frozen in time: it imports no app code.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.createTable('channel')
		.addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('name', 'text', (c) => c.notNull())
		.addColumn('frame_rate', 'text', (c) => c.notNull().defaultTo('29.97'))
		.addColumn('call_to_action', 'text', (c) => c.notNull().defaultTo(''))
		.addColumn('contact', 'text', (c) => c.notNull().defaultTo(''))
		.addColumn('description_limit', 'integer', (c) => c.notNull().defaultTo(5000))
		.addColumn('version', 'integer', (c) => c.notNull().defaultTo(1))
		.addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
		.execute();

	await db.schema
		.createTable('person')
		.addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('email', 'text', (c) => c.notNull())
		.addColumn('name', 'text', (c) => c.notNull())
		.addColumn('password_hash', 'text')
		.addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
		.execute();
	await sql`CREATE UNIQUE INDEX person_email_unique ON person (lower(email))`.execute(db);

	await db.schema
		.createTable('membership')
		.addColumn('channel_id', 'uuid', (c) =>
			c.notNull().references('channel.id').onDelete('cascade')
		)
		.addColumn('person_id', 'uuid', (c) => c.notNull().references('person.id').onDelete('cascade'))
		.addColumn('roles', sql`text[]`, (c) => c.notNull().defaultTo(sql`'{}'::text[]`))
		.addColumn('disabled_at', 'timestamptz')
		.addColumn('invited_by', 'uuid', (c) => c.references('person.id').onDelete('set null'))
		.addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
		.addPrimaryKeyConstraint('membership_pk', ['channel_id', 'person_id'])
		.addCheckConstraint(
			'membership_roles_known',
			sql`roles <@ ARRAY['producer','host','camera','editor','merch']::text[]`
		)
		.execute();
	await db.schema.createIndex('membership_person').on('membership').column('person_id').execute();

	await db.schema
		.createTable('person_session')
		.addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('person_id', 'uuid', (c) => c.notNull().references('person.id').onDelete('cascade'))
		.addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
		.addColumn('expires_at', 'timestamptz', (c) => c.notNull())
		.execute();
	await db.schema
		.createIndex('person_session_person')
		.on('person_session')
		.column('person_id')
		.execute();

	await db.schema
		.createTable('one_time_link')
		.addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('person_id', 'uuid', (c) => c.notNull().references('person.id').onDelete('cascade'))
		.addColumn('channel_id', 'uuid', (c) => c.references('channel.id').onDelete('cascade'))
		.addColumn('purpose', 'text', (c) => c.notNull().check(sql`purpose IN ('invite', 'reset')`))
		.addColumn('token_hash', 'text', (c) => c.notNull().unique())
		.addColumn('expires_at', 'timestamptz', (c) => c.notNull())
		.addColumn('used_at', 'timestamptz')
		.addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
		.execute();

	await db.schema
		.createTable('api_token')
		.addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('person_id', 'uuid', (c) => c.notNull().references('person.id').onDelete('cascade'))
		.addColumn('channel_id', 'uuid', (c) =>
			c.notNull().references('channel.id').onDelete('cascade')
		)
		.addColumn('label', 'text', (c) => c.notNull())
		.addColumn('token_hash', 'text', (c) => c.notNull().unique())
		.addColumn('token_hint', 'text', (c) => c.notNull())
		.addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
		.addColumn('last_used_at', 'timestamptz')
		.addColumn('revoked_at', 'timestamptz')
		.execute();
	await db.schema.createIndex('api_token_person').on('api_token').column('person_id').execute();

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

	await db.schema
		.createTable('outbox')
		.addColumn('id', 'uuid', (c) => c.primaryKey().defaultTo(sql`gen_random_uuid()`))
		.addColumn('channel_id', 'uuid', (c) => c.references('channel.id').onDelete('set null'))
		.addColumn('to_address', 'text', (c) => c.notNull())
		.addColumn('subject', 'text', (c) => c.notNull())
		.addColumn('body_text', 'text', (c) => c.notNull())
		.addColumn('attempts', 'integer', (c) => c.notNull().defaultTo(0))
		.addColumn('next_attempt_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
		.addColumn('last_error', 'text')
		.addColumn('sent_at', 'timestamptz')
		.addColumn('created_at', 'timestamptz', (c) => c.notNull().defaultTo(sql`now()`))
		.execute();
	await sql`CREATE INDEX outbox_pending ON outbox (next_attempt_at) WHERE sent_at IS NULL`.execute(
		db
	);
}

export async function down(db: Kysely<any>): Promise<void> {
	for (const table of [
		'outbox',
		'sign_in_failure',
		'api_token',
		'one_time_link',
		'person_session',
		'membership',
		'person',
		'channel'
	]) {
		await db.schema.dropTable(table).ifExists().execute();
	}
}
