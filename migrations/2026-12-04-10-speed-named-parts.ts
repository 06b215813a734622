import { type Kysely, sql } from 'kysely';

/**
 * "Named in the script" (featured parts) first asks which of the script's words begin a part's
 * name or SKU, then looks up only the phrases that start with one of them. The first question is
 * a range of the index ("begins with this word and a space"), which needs byte order whatever the
 * database's collation: the lower(sku) and lower(name) indexes are remade as COLLATE "C". Equality
 * under "C" is the same as under any deterministic collation, so the exact lookups use them too.
 * Frozen in time: it imports no app code.
 */
export async function up(db: Kysely<any>): Promise<void> {
	await sql`CREATE INDEX part_channel_lower_sku_bytes ON part (channel_id, (lower(sku) COLLATE "C"))`.execute(
		db
	);
	await sql`CREATE INDEX part_channel_lower_name_bytes ON part (channel_id, (lower(name) COLLATE "C"))`.execute(
		db
	);
	await db.schema.dropIndex('part_channel_lower_sku').ifExists().execute();
	await db.schema.dropIndex('part_channel_lower_name').ifExists().execute();
}

export async function down(db: Kysely<any>): Promise<void> {
	await sql`CREATE INDEX IF NOT EXISTS part_channel_lower_sku ON part (channel_id, lower(sku))`.execute(
		db
	);
	await sql`CREATE INDEX IF NOT EXISTS part_channel_lower_name ON part (channel_id, lower(name))`.execute(
		db
	);
	await db.schema.dropIndex('part_channel_lower_name_bytes').ifExists().execute();
	await db.schema.dropIndex('part_channel_lower_sku_bytes').ifExists().execute();
}
