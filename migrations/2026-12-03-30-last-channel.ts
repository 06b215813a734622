import type { Kysely } from 'kysely';

/**
 * The channel a person last chose, so a new sign-in (on any browser) opens it. NULL until they
 * first switch; cleared when the channel is deleted. Frozen in time: it imports no app code.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await db.schema
		.alterTable('person')
		.addColumn('last_channel_id', 'uuid', (c) => c.references('channel.id').onDelete('set null'))
		.execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await db.schema.alterTable('person').dropColumn('last_channel_id').execute();
}
