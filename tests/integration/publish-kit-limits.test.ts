/**
 * The publish kit counts the description as video platforms do and flags what they refuse:
 * UTF-8 bytes against 5,000, `<` and `>` with where they are, and a title over 100 characters
 * (all from memory of a large platform's upload documentation; tests/REFERENCES.md "Publish kit").
 */
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { Visitor, demo, signedIn, sql } from '../helpers/http';

let merch: Visitor;
let episodeId: string;

beforeAll(async () => {
	const channelId = (await sql(`SELECT id FROM channel WHERE name = 'Torquehaven Garage'`))[0].id;
	merch = await signedIn(demo.merch);
	const slug = `kit-limits-test-${Date.now()}`;
	const [episode] = await sql(
		`INSERT INTO episode (channel_id, title, slug, logline, target_runtime_seconds, frame_rate, stage) VALUES ($1, $2, $3, $4, 600, '29.97', 'edit') RETURNING id`,
		[
			channelId,
			`Rear leaf pack swap on a 2004 midsize pickup, start to finish, with every bolt torqued ${'!'.repeat(30)}`,
			slug,
			'Lift <2 in at 20°C 🔧'
		]
	);
	episodeId = episode.id;
});

afterAll(async () => {
	await sql(`DELETE FROM episode WHERE slug LIKE 'kit-limits-test-%'`);
});

describe('publish kit limits', () => {
	test('the description is counted in UTF-8 bytes and < > are flagged where they are', async () => {
		const answer = await merch.api(`/api/episodes/${episodeId}/publish-kit`);
		expect(answer.status).toBe(200);
		const kit = answer.body;
		// RFC 3629 byte lengths, as Node's Buffer.byteLength computes them.
		expect(kit.length).toBe(Buffer.byteLength(kit.text, 'utf8'));
		expect(kit.length).toBeGreaterThan(kit.characters);
		expect(kit.forbidden[0]).toEqual({ character: '<', line: 1, column: 6 });
		expect(kit.problems.join(' ')).toMatch(/“<” on line 1, column 6/);
	});

	test('a title over 100 characters is flagged in the merch team’s words', async () => {
		const kit = (await merch.api(`/api/episodes/${episodeId}/publish-kit`)).body;
		expect(kit.title.length).toBe(kit.title.text.length);
		expect(kit.title.limit).toBe(100);
		expect(kit.title.problems[0]).toMatch(/title is \d+ characters; video platforms take 100/);
	});

	test('a channel limit set above 5,000 is held to the platforms’ 5,000', async () => {
		const [{ id: channelId, description_limit: before }] = await sql(
			`SELECT channel.id, description_limit FROM channel JOIN episode ON episode.channel_id = channel.id WHERE episode.id = $1`,
			[episodeId]
		);
		await sql(`UPDATE channel SET description_limit = 6000 WHERE id = $1`, [channelId]);
		try {
			const kit = (await merch.api(`/api/episodes/${episodeId}/publish-kit`)).body;
			expect(kit.limit).toBe(5000);
		} finally {
			await sql(`UPDATE channel SET description_limit = $2 WHERE id = $1`, [channelId, before]);
		}
	});
});
