import { type Kysely, sql } from 'kysely';

/**
 * Two more hazard flags: tyre mounting and inflation, and road tests. The check constraints on
 * segment.hazards and caution.hazard name the allowed ids, so both are replaced with the longer
 * list. Frozen in time: it imports no app code.
 */
const BEFORE = [
	'raised-vehicle',
	'compressed-springs',
	'heat-torch',
	'cutting-grinding',
	'brakes',
	'steering',
	'airbags-electrical'
];
const AFTER = [...BEFORE, 'tyre-inflation', 'road-test'];

const textList = (values: string[]) => sql.join(values.map((value) => sql.lit(value)));

async function allow(db: Kysely<any>, hazards: string[]): Promise<void> {
	await sql`ALTER TABLE segment DROP CONSTRAINT IF EXISTS segment_hazards_check`.execute(db);
	await sql`ALTER TABLE segment ADD CONSTRAINT segment_hazards_check CHECK (hazards <@ ARRAY[${textList(hazards)}]::text[])`.execute(
		db
	);
	await sql`ALTER TABLE caution DROP CONSTRAINT IF EXISTS caution_hazard_check`.execute(db);
	await sql`ALTER TABLE caution ADD CONSTRAINT caution_hazard_check CHECK (hazard IN (${textList(hazards)}))`.execute(
		db
	);
}

export async function up(db: Kysely<any>): Promise<void> {
	await allow(db, AFTER);
}

export async function down(db: Kysely<any>): Promise<void> {
	await sql`DELETE FROM caution WHERE hazard IN ('tyre-inflation', 'road-test')`.execute(db);
	await sql`UPDATE segment SET hazards = array_remove(array_remove(hazards, 'tyre-inflation'), 'road-test')`.execute(
		db
	);
	await allow(db, BEFORE);
}
