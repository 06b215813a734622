import { type Kysely } from 'kysely';

/**
 * The mail sender claims an outbox row for a while (claimed_until) and commits before it talks to
 * SMTP, so no transaction or row lock is held during the conversation. A claim that ran out (a
 * sender that crashed) makes the row claimable again. Frozen in time: it imports no app code.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema.alterTable('outbox').addColumn('claimed_until', 'timestamptz').execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.alterTable('outbox').dropColumn('claimed_until').execute();
}
