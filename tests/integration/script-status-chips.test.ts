/**
 * The script's approval chip says the same thing on every page: the episode list (page and API),
 * the overview, the script page and the host's home worklist all read it from one place, so an
 * approved script edited afterwards shows "Changed since approval" everywhere, not "Script
 * approved" on the list and "changed" on the overview.
 *
 * Outside sources for the checks:
 * - The script fingerprint is SHA-256 (FIPS 180-4); the database's `sha256()` (PostgreSQL
 *   documentation, "Binary String Functions", tests/REFERENCES.md "Database and text") is checked
 *   against Node.js's own `node:crypto` over the same bytes.
 */
import { createHash } from 'node:crypto';
import { beforeAll, describe, expect, test } from 'vitest';
import { Visitor, demo, signedIn, sql } from '../helpers/http';
import { saveScript } from '../helpers/scripts';

let channelId: string;
let producer: Visitor;
let host: Visitor;

/** The words of the chip on an HTML page, in the part of the page that follows `after`. */
function chipAfter(html: string, after: string): string | null {
	const start = html.indexOf(after);
	if (start < 0) return null;
	const rest = html.slice(start);
	const end = rest.indexOf('</li>', 1);
	const part = end < 0 ? rest : rest.slice(0, end);
	const words = ['Changed since approval', 'Script approved', 'Awaiting approval', 'Script draft'];
	const found = words
		.map((word) => ({ word, at: part.indexOf(word) }))
		.filter((hit) => hit.at >= 0)
		.sort((a, b) => a.at - b.at);
	return found[0]?.word ?? null;
}

async function newScriptEpisode() {
	const slug = `chips-${Date.now()}`;
	const title = `Chip check ${slug}`;
	const [episode] = await sql(
		`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate, stage)
		 VALUES ($1, $2, $3, 600, '29.97', 'script') RETURNING id`,
		[channelId, title, slug]
	);
	const made = await producer.api(`/api/episodes/${episode.id}/segments`, {
		method: 'POST',
		json: { kind: 'tips', title: 'Torque in a star pattern', plannedSeconds: 30 }
	});
	expect(made.status).toBe(201);
	return { id: episode.id as string, title, segment: made.body.segment };
}

async function approve(episodeId: string) {
	const state = (await producer.api(`/api/episodes/${episodeId}/script-review`)).body;
	const approved = await producer.api(`/api/episodes/${episodeId}/script-review`, {
		method: 'POST',
		json: { action: 'approve', body: '', fingerprint: state.fingerprint }
	});
	expect(approved.status).toBe(200);
}

/** What each place says about the episode's script. */
async function chips(episode: { id: string; title: string }) {
	const list = await (await producer.request('/episodes')).text();
	const listed = (await producer.api('/api/episodes')).body.items.find(
		(row: { id: string }) => row.id === episode.id
	);
	const overview = await (await producer.request(`/episodes/${episode.id}`)).text();
	const script = await (await producer.request(`/episodes/${episode.id}/script`)).text();
	const detail = (await producer.api(`/api/episodes/${episode.id}`)).body.episode;
	return {
		listPage: chipAfter(list, `>${episode.title}<`),
		listApi: listed.scriptShown,
		detailApi: detail.scriptShown,
		overview: chipAfter(overview, 'id="script-heading"'),
		scriptPage: chipAfter(script, 'id="approval-heading"')
	};
}

beforeAll(async () => {
	[{ id: channelId }] = await sql(`SELECT id FROM channel WHERE name = 'Torquehaven Garage'`);
	producer = await signedIn(demo.producer);
	host = await signedIn(demo.host);
});

describe('the script chip agrees on every page', () => {
	test('approved, then edited: every page says "Changed since approval"; approved again: "Script approved"', async () => {
		const episode = await newScriptEpisode();
		await saveScript(
			producer,
			episode.segment.id,
			'Snug each nut, then torque them across the hub.'
		);
		await approve(episode.id);
		const approved = await chips(episode);
		expect([approved.listPage, approved.overview, approved.scriptPage]).toEqual([
			'Script approved',
			'Script approved',
			'Script approved'
		]);
		await saveScript(
			producer,
			episode.segment.id,
			'Snug each nut, then torque them in a star pattern.'
		);
		const { listApi, detailApi, ...pages } = await chips(episode);
		// What a person reads first: before the fix the list still said "Script approved" here.
		expect(pages).toEqual({
			listPage: 'Changed since approval',
			overview: 'Changed since approval',
			scriptPage: 'Changed since approval'
		});
		expect({ listApi, detailApi }).toEqual({ listApi: 'changed', detailApi: 'changed' });
		expect([approved.listApi, approved.detailApi]).toEqual(['approved', 'approved']);
		// The host's bench says so too, and what to do about it.
		const home = await (await host.request('/')).text();
		expect(home).toContain(`Script changed since approval: ${episode.title}`);

		await approve(episode.id);
		expect((await chips(episode)).listPage).toBe('Script approved');
		expect(await (await host.request('/')).text()).not.toContain(
			`Script changed since approval: ${episode.title}`
		);
	});

	test('the database computes the same fingerprint as SHA-256 over the segments in rundown order', async () => {
		const episodes = await sql(`SELECT id FROM episode WHERE channel_id = $1`, [channelId]);
		expect(episodes.length).toBeGreaterThan(1);
		for (const { id } of episodes) {
			const rows = await sql(
				`SELECT s.id, ss.body FROM segment s JOIN segment_script ss ON ss.segment_id = s.id
				 WHERE s.episode_id = $1 ORDER BY s.position`,
				[id]
			);
			// FIPS 180-4 SHA-256 by node:crypto, over each segment's id, NUL, text, SOH.
			const hash = createHash('sha256');
			for (const row of rows) hash.update(`${row.id}\u0000${row.body}\u0001`);
			const state = (await producer.api(`/api/episodes/${id}/script-review`)).body;
			expect(state.fingerprint, id).toBe(hash.digest('hex'));
		}
	});
});
