/**
 * Makes a seeded database look like a real channel's size, for the query-budget test and the
 * benches: copies rows together with everything that hangs off them by foreign key, in a few
 * INSERT … SELECT statements over generate_series (no row-by-row round trips).
 *
 * The copier reads the foreign keys and unique indexes from the PostgreSQL catalogue, so a new
 * table under an episode is copied without changes here: each copy k (2…factor) of a root row gets
 * a new id, and every row below it (by a foreign key to a copied table) is copied with its
 * references pointed at copy k. A unique column that no copied reference makes unique again gets
 * copy k's number added (`slug` → `slug-k`-like text, `position` + 1000·(k-1)).
 */
import { addParts } from './bench-paging-seed.ts';
import type pg from 'pg';

type Query = Pick<pg.Pool, 'query'>;

interface ForeignKey {
	child: string;
	column: string;
	parent: string;
	notNull: boolean;
}

interface Column {
	name: string;
	type: string;
}

async function catalogue(database: Query) {
	const foreignKeys = (
		await database.query<ForeignKey>(
			`SELECT con.conrelid::regclass::text AS child, a.attname AS column,
			        con.confrelid::regclass::text AS parent, a.attnotnull AS "notNull"
			 FROM pg_constraint con
			 JOIN pg_attribute a ON a.attrelid = con.conrelid AND a.attnum = con.conkey[1]
			 WHERE con.contype = 'f' AND array_length(con.conkey, 1) = 1
			   AND con.connamespace = 'public'::regnamespace
			 ORDER BY child, a.attnum`
		)
	).rows;
	const uniques = (
		await database.query<{ table: string; columns: string[] }>(
			`SELECT i.indrelid::regclass::text AS table,
			        array(SELECT attname FROM pg_attribute WHERE attrelid = i.indrelid AND attnum = ANY(i.indkey))::text[] AS columns
			 FROM pg_index i JOIN pg_class c ON c.oid = i.indrelid
			 WHERE i.indisunique AND NOT i.indisprimary AND c.relnamespace = 'public'::regnamespace`
		)
	).rows;
	return { foreignKeys, uniques };
}

async function columnsOf(database: Query, table: string): Promise<Column[]> {
	return (
		await database.query<Column>(
			`SELECT attname AS name, format_type(atttypid, atttypmod) AS type FROM pg_attribute
			 WHERE attrelid = $1::regclass AND attnum > 0 AND NOT attisdropped AND attgenerated = ''
			 ORDER BY attnum`,
			[table]
		)
	).rows;
}

const quote = (name: string) => `"${name.replace(/"/g, '""')}"`;

/**
 * Copies the rows of `root` chosen by `where` (SQL over the table's columns, alias `t`) factor − 1
 * times, with every row below them; a `title` of a root copy gets " · k" added.
 * Returns how many rows each table gained.
 */
export async function copyWithChildren(
	pool: pg.Pool,
	root: string,
	where: string,
	factor: number,
	params: readonly unknown[] = []
): Promise<Record<string, number>> {
	// Temporary tables belong to one connection: every statement goes through the same client.
	const client = await pool.connect();
	try {
		return await copyOnOneConnection(client, root, where, factor, params);
	} finally {
		client.release();
	}
}

async function copyOnOneConnection(
	database: Query,
	root: string,
	where: string,
	factor: number,
	params: readonly unknown[]
): Promise<Record<string, number>> {
	const { foreignKeys, uniques } = await catalogue(database);
	// CREATE TABLE AS takes no bind parameters: the root's few values go in as quoted literals.
	where = where.replace(
		/\$(\d+)/g,
		(_, index) => `'${String(params[Number(index) - 1]).replace(/'/g, "''")}'`
	);
	const copied = new Map<string, string>(); // table → its temporary id map
	const added: Record<string, number> = {};
	const run = Math.random().toString(36).slice(2, 8);

	// Every table below the root by some chain of foreign keys.
	const below = new Set<string>([root]);
	for (let grew = true; grew;) {
		grew = false;
		for (const key of foreignKeys)
			if (below.has(key.parent) && !below.has(key.child) && key.child !== key.parent) {
				below.add(key.child);
				grew = true;
			}
	}

	async function copyTable(table: string, selection: string) {
		const columns = await columnsOf(database, table);
		const hasId = columns.some((column) => column.name === 'id' && column.type === 'uuid');
		const keys = foreignKeys.filter((key) => key.child === table && copied.has(key.parent));
		const mapName = `copy_${table}_${run}`;
		// Which copy each row belongs to: the root's generate_series, or the copy of its parent.
		const primary =
			table === root
				? null
				: (keys.find((key) => key.notNull) ?? keys.find((key) => !key.notNull) ?? null);
		if (table !== root && !primary) return;
		const from =
			table === root
				? `${quote(table)} t CROSS JOIN generate_series(2, ${factor}) AS k(k) WHERE ${selection}`
				: `${quote(table)} t JOIN ${copied.get(primary!.parent)} p ON p.old = t.${quote(primary!.column)}`;
		const copyNumber = table === root ? 'k.k' : 'p.k';
		if (hasId) {
			await database.query(
				`CREATE TEMP TABLE ${mapName} AS SELECT t.id AS old, gen_random_uuid() AS new, ${copyNumber} AS k FROM ${from}`
			);
			await database.query(`CREATE INDEX ON ${mapName} (old, k)`);
			copied.set(table, mapName);
		}
		const mappedColumns = new Set(keys.map((key) => key.column));
		if (hasId) mappedColumns.add('id');
		// Unique indexes that no mapped column makes unique again: bump one of their columns.
		const bumped = new Set<string>();
		for (const unique of uniques.filter((index) => index.table === table)) {
			if (unique.columns.some((column) => mappedColumns.has(column))) continue;
			const column = columns.find(
				(c) =>
					unique.columns.includes(c.name) &&
					!foreignKeys.some((k) => k.child === table && k.column === c.name)
			);
			if (column) bumped.add(column.name);
		}
		const joins: string[] = [];
		const values = columns.map((column) => {
			const name = quote(column.name);
			if (column.name === 'id' && hasId) return 'm.new';
			const key = keys.find((candidate) => candidate.column === column.name);
			if (key) {
				const alias = `f_${column.name}`;
				joins.push(
					`LEFT JOIN ${copied.get(key.parent)} ${alias} ON ${alias}.old = t.${name} AND ${alias}.k = ${copyNumber}`
				);
				return `coalesce(${alias}.new, t.${name})`;
			}
			if (bumped.has(column.name)) {
				if (/^(integer|smallint|bigint)$/.test(column.type))
					return `t.${name} + 1000 * (${copyNumber} - 1)`;
				// Tracked-link codes are 6–16 letters and digits; every other unique text takes a suffix.
				return column.name === 'code'
					? `left(t.${name}, 10) || 'x' || ${copyNumber}`
					: `t.${name} || '-' || ${copyNumber}`;
			}
			if (table === root && column.name === 'title') return `t.${name} || ' · ' || ${copyNumber}`;
			return `t.${name}`;
		});
		const source = hasId ? `${quote(table)} t JOIN ${mapName} m ON m.old = t.id` : from;
		const copyNumberFrom = hasId ? 'm.k' : copyNumber;
		const result = await database.query(
			`INSERT INTO ${quote(table)} (${columns.map((column) => quote(column.name)).join(', ')})
			 SELECT ${values.join(', ').replaceAll(copyNumber, copyNumberFrom)}
			 FROM ${source} ${joins.join(' ').replaceAll(copyNumber, copyNumberFrom)}`
		);
		added[table] = (added[table] ?? 0) + (result.rowCount ?? 0);
	}

	await copyTable(root, where);
	// The rest in an order where every copied parent comes before its children.
	const pending = new Set([...below].filter((table) => table !== root));
	while (pending.size) {
		const ready = [...pending].filter((table) =>
			foreignKeys
				.filter((key) => key.child === table && below.has(key.parent) && key.parent !== table)
				.every((key) => !pending.has(key.parent))
		);
		const next = ready.length ? ready : [pending.values().next().value!];
		for (const table of next) {
			pending.delete(table);
			await copyTable(table, '');
		}
	}
	for (const mapName of copied.values()) await database.query(`DROP TABLE ${mapName}`);
	return added;
}

/**
 * Demo data ×factor: every episode of the channel copied factor − 1 times with all its work, and
 * the one episode named by `wholeEpisodeId` grown inside itself: its segments (with scripts,
 * shots, takes, cautions, notes), chapters and stage history ×factor.
 */
export async function scaleDemo(
	database: pg.Pool,
	channelId: string,
	factor: number,
	wholeEpisodeId: string
): Promise<Record<string, number>> {
	const total: Record<string, number> = {};
	const add = (counts: Record<string, number>) => {
		for (const [table, count] of Object.entries(counts)) total[table] = (total[table] ?? 0) + count;
	};
	add(await copyWithChildren(database, 'episode', 't.channel_id = $1', factor, [channelId]));
	for (const table of ['segment', 'chapter', 'stage_move', 'segment_note'])
		add(await copyWithChildren(database, table, 't.episode_id = $1', factor, [wholeEpisodeId]));
	await database.query('ANALYZE');
	return total;
}

export const BENCH_EPISODES = 10_000;
export const BENCH_PARTS = 200_000;
export const BENCH_CHAPTERS = 10_000;
export const BENCH_CHAPTER_EPISODE_SLUG = 'bench-ten-thousand-chapters';

/**
 * A real channel's size in the channel named `channelName` (the demo's): its episodes copied with
 * all their work up to BENCH_EPISODES episodes in all, one of them an episode of BENCH_CHAPTERS
 * chapters; and catalogue parts up to BENCH_PARTS, of fictional brands. Set-based statements
 * (generate_series, INSERT … SELECT), so it takes seconds to a few minutes, not hours.
 */
export async function fillBenchChannel(database: pg.Pool, channelName: string) {
	const started = performance.now();
	const [channel] = (
		await database.query<{ id: string }>(`SELECT id FROM channel WHERE name = $1`, [channelName])
	).rows;
	if (!channel) throw new Error(`no channel named ${channelName}: seed the demo first`);
	const count = async (sqlText: string) =>
		Number((await database.query<{ n: number }>(sqlText, [channel.id])).rows[0].n);
	// A run stopped half way leaves its chapter episode: start that part again.
	await database.query(`DELETE FROM episode WHERE channel_id = $1 AND slug = $2`, [
		channel.id,
		BENCH_CHAPTER_EPISODE_SLUG
	]);
	const episodesBefore = await count(
		`SELECT count(*)::int AS n FROM episode WHERE channel_id = $1`
	);
	if (episodesBefore >= BENCH_EPISODES) return { alreadyFilled: true, seconds: 0 };

	// The chapter episode: a chapter every 12 s at 29.97 (360 frames at 30000/1001, from memory;
	// the rules ask for at least 10 s between chapters), the cut 3 s past the last one.
	const rate = 30000 / 1001;
	const cut = Math.round((BENCH_CHAPTERS * 12 + 3) * rate);
	const [chapterEpisode] = (
		await database.query<{ id: string }>(
			`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate, stage, cut_duration_frames)
			 VALUES ($1, 'Bench: ten thousand chapters of a frame-off rebuild', $2, 120000, '29.97', 'edit', $3)
			 RETURNING id`,
			[channel.id, BENCH_CHAPTER_EPISODE_SLUG, cut]
		)
	).rows;
	await database.query(
		`INSERT INTO chapter (episode_id, start_frame, title)
		 SELECT $1, round(i * 12 * 30000.0 / 1001)::int,
		   (i + 1) || '. ' || (ARRAY['Strip the bed','Lift the body','Wire-brush the rails','Prime the frame','Torque the mounts','Bleed the lines'])[1 + i % 6]
		 FROM generate_series(0, ${BENCH_CHAPTERS - 1}) AS i`,
		[chapterEpisode.id]
	);

	// Every other episode of the channel copied until there are BENCH_EPISODES, then the surplus dropped.
	const others = episodesBefore;
	const factor = Math.ceil((BENCH_EPISODES - 1) / others);
	await copyWithChildren(database, 'episode', 't.channel_id = $1 AND t.id <> $2', factor, [
		channel.id,
		chapterEpisode.id
	]);
	const surplus =
		(await count(`SELECT count(*)::int AS n FROM episode WHERE channel_id = $1`)) - BENCH_EPISODES;
	if (surplus > 0)
		await database.query(
			`DELETE FROM episode WHERE id IN (
			   SELECT id FROM episode WHERE channel_id = $1 AND title LIKE '% · %' ORDER BY created_at DESC, id LIMIT ${surplus})`,
			[channel.id]
		);

	const partsBefore = await count(`SELECT count(*)::int AS n FROM part WHERE channel_id = $1`);
	await addParts(database, channel.id, Math.max(0, BENCH_PARTS - partsBefore), 'BS');
	await database.query('ANALYZE');
	return {
		alreadyFilled: false,
		chapterEpisodeId: chapterEpisode.id,
		seconds: (performance.now() - started) / 1000
	};
}
