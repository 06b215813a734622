/**
 * compiledOnce (src/lib/server/db/compiled-once.ts): a query compiled once answers each run with
 * that run's values, keeps the constants it was built with, and its rows come back camelCased
 * through the plugins as any other query's do; a named value the query never uses is refused.
 * Checked against the test database's own rows (PostgreSQL documentation, "Parameters" of the
 * extended query protocol: each $n is bound afresh on every execution).
 */
import { CamelCasePlugin, Kysely, PostgresDialect } from 'kysely';
import pg from 'pg';
import { afterAll, describe, expect, inject, test } from 'vitest';
import { sql } from '../helpers/http';
import { compiledOnce } from '$lib/server/db/compiled-once';
import type { Database } from '$lib/server/db/types';

const executor = new Kysely<Database>({
	dialect: new PostgresDialect({
		pool: new pg.Pool({ connectionString: inject('databaseUrl'), max: 1 })
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
});
