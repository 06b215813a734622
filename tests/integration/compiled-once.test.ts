/**
 * compiledOnce (src/lib/server/db/compiled-once.ts): a query compiled once answers each run with
 * that run's values, keeps the constants it was built with, and its rows come back camelCased
 * through the plugins as any other query's do; a named value the query never uses is refused.
 * Checked against the test database's own rows (PostgreSQL documentation, "Parameters" of the
 * extended query protocol: each $n is bound afresh on every execution). As in the app, the pool
 * sends them as named prepared statements (prepared-statements.ts): the connection's own
 * pg_prepared_statements view lists them (PostgreSQL documentation, "pg_prepared_statements"),
 * and the answers stay right past the fifth run, where PostgreSQL may switch to a generic plan
 * (PostgreSQL documentation, PREPARE, "Notes").
 */
import { CamelCasePlugin, Kysely, PostgresDialect, sql as rawSql } from 'kysely';
import pg from 'pg';
import { afterAll, describe, expect, inject, test } from 'vitest';
import { sql } from '../helpers/http';
import { compiledOnce } from '$lib/server/db/compiled-once';
import { preparedStatementsOn } from '$lib/server/db/prepared-statements';
import type { Database } from '$lib/server/db/types';

const executor = new Kysely<Database>({
	dialect: new PostgresDialect({
		// One connection, so the statements it prepared can be read back on it.
		pool: preparedStatementsOn(new pg.Pool({ connectionString: inject('databaseUrl'), max: 1 }))
	}),
	plugins: [new CamelCasePlugin()]
});

afterAll(() => executor.destroy());

describe('compiledOnce', () => {
	test('each run binds its own values, keeps the built-in constants, and camelCases the rows', async () => {
		const channels = await sql<{ id: string; name: string }>(
			`SELECT id, name FROM channel ORDER BY name`
		);
		expect(channels.length).toBeGreaterThanOrEqual(2);
		let builds = 0;
		const query = compiledOnce(['channelId'], ({ channelId }) => {
			builds++;
			return executor
				.selectFrom('channel')
				.select(['channel.id', 'channel.name', 'channel.frameRate'])
				.where('channel.id', '=', channelId)
				.where('channel.name', '!=', 'no channel is called this');
		});
		for (const channel of channels) {
			const { rows } = await query(executor, { channelId: channel.id });
			expect(rows).toEqual([{ id: channel.id, name: channel.name, frameRate: expect.any(String) }]);
		}
		expect(builds).toBe(1);
	});

	test('a named value the query never uses is refused on first run', async () => {
		const query = compiledOnce(['channelId', 'unused'], ({ channelId }) =>
			executor.selectFrom('channel').select('channel.id').where('channel.id', '=', channelId)
		);
		await expect(query(executor, { channelId: 'x', unused: 'y' })).rejects.toThrow(
			/never uses “unused”/
		);
	});

	test('runs as a named prepared statement on the connection, with right answers past the fifth run', async () => {
		const channels = await sql<{ id: string; name: string }>(
			`SELECT id, name FROM channel ORDER BY name`
		);
		const query = compiledOnce(['channelId'], ({ channelId }) =>
			executor
				.selectFrom('channel')
				.select(['channel.name'])
				.where('channel.id', '=', channelId)
				.where('channel.name', '!=', rawSql.lit('a second query of this file'))
		);
		for (let run = 0; run < 8; run++) {
			const channel = channels[run % channels.length];
			const { rows } = await query(executor, { channelId: channel.id });
			expect(rows).toEqual([{ name: channel.name }]);
		}
		const prepared = await rawSql<{ name: string; statement: string }>`
			SELECT name, statement FROM pg_prepared_statements`.execute(executor);
		const ours = prepared.rows.filter((row) =>
			row.statement.includes('a second query of this file')
		);
		expect(ours).toHaveLength(1);
		expect(ours[0].name).toMatch(/^wr_once_\d+$/);
	});

	test('other queries still go out unnamed', async () => {
		await executor.selectFrom('channel').select('channel.id as adHocMarker').execute();
		const prepared = await rawSql<{ statement: string }>`
			SELECT statement FROM pg_prepared_statements`.execute(executor);
		expect(prepared.rows.length).toBeGreaterThan(0);
		expect(prepared.rows.filter((row) => row.statement.includes('ad_hoc_marker'))).toEqual([]);
	});
});
