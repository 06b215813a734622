/** The one Kysely instance of the server. */
import { CamelCasePlugin, Kysely, PostgresDialect } from 'kysely';
import pg from 'pg';
import { env } from '$env/dynamic/private';
import type { Database } from './types';
import { queryCountLog } from './query-count';
import { preparedStatementsOn } from './prepared-statements';

// PostgreSQL bigint and numeric come back as strings by default; counts here stay well inside 2^53.
pg.types.setTypeParser(pg.types.builtins.INT8, (value) => Number(value));
pg.types.setTypeParser(pg.types.builtins.NUMERIC, (value) => Number(value));
// Calendar dates stay 'YYYY-MM-DD' text: a publish date has no time zone.
pg.types.setTypeParser(pg.types.builtins.DATE, (value) => value);

function createDatabase(): Kysely<Database> {
	const connectionString = env.DATABASE_URL;
	if (!connectionString) {
		throw new Error(
			'DATABASE_URL is not set: start Wrenchroll with `npm start`, which sets it for you.'
		);
	}
	const pool = new pg.Pool({
		connectionString,
		max: Number(env.DATABASE_POOL_SIZE ?? 10),
		// Without it, a query waits forever for a connection to a server that accepts but never
		// answers (or for a free pooled one): fail instead, so the request gets a 503 (see db/outage.ts).
		connectionTimeoutMillis: Number(env.DATABASE_CONNECT_TIMEOUT_MS ?? 5000)
	});
	// The queries compiled once go out as named prepared statements (prepared-statements.ts).
	preparedStatementsOn(pool);
	// An idle connection dropped by the server (restart, failover) must not take the app down; the pool reconnects.
	pool.on('error', (failure) => console.error('database connection lost:', failure.message));
	return new Kysely<Database>({
		dialect: new PostgresDialect({ pool }),
		plugins: [new CamelCasePlugin()],
		// Only with WRENCHROLL_COUNT_QUERIES=1 (the query-budget tests): see query-count.ts.
		...(queryCountLog ? { log: queryCountLog } : {})
	});
}

let instance: Kysely<Database> | undefined;

/** Lazily created so that `vite build` (which imports server modules) needs no database. */
export const db: Kysely<Database> = new Proxy({} as Kysely<Database>, {
	get(_target, property) {
		instance ??= createDatabase();
		const value = Reflect.get(instance, property, instance);
		return typeof value === 'function' ? value.bind(instance) : value;
	}
});
