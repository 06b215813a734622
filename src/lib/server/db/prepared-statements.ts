/**
 * Named prepared statements for the queries compiled once (compiled-once.ts). PostgreSQL parses,
 * analyses and plans an unnamed statement on every run; a named one is parsed once per connection
 * and its plan can be kept for the next runs (PostgreSQL documentation, PREPARE: "prepared
 * statements only last for the duration of the current database session", and its notes on
 * generic and custom plans). The reads every page makes (who is calling, the episode, its gate
 * materials with seven aggregates) spent a good part of their database time on that.
 *
 * Only SQL registered here is sent named; every other query goes out as before.
 */
import type pg from 'pg';

const names = new Map<string, string>();

/** The statement name for this SQL text, the same for every call with the same text. */
export function statementName(sql: string): string {
	let name = names.get(sql);
	if (!name) names.set(sql, (name = `wr_once_${names.size + 1}`));
	return name;
}

/** Whether this SQL goes out as a named prepared statement. */
export const isNamedStatement = (sql: string): boolean => names.has(sql);

type Query = (config: unknown, values?: unknown, callback?: unknown) => unknown;

/**
 * Makes every connection of the pool send registered SQL as a named statement (node-postgres's
 * `{ name, text, values }` query config: it skips the parse step when the connection already has
 * the statement). Kysely's driver calls `client.query(sql, parameters)`, which is what is caught.
 */
export function preparedStatementsOn<Pool extends pg.Pool>(pool: Pool): Pool {
	pool.on('connect', (client) => {
		const query = client.query.bind(client) as Query;
		const named: Query = (config, values, callback) => {
			const name = typeof config === 'string' ? names.get(config) : undefined;
			return name && Array.isArray(values)
				? query({ name, text: config, values }, callback)
				: query(config, values, callback);
		};
		client.query = named as typeof client.query;
	});
	return pool;
}
