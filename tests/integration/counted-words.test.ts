/**
 * Counts on the pages read right for one thing and for many: "1 file", "0 of 1 shot has", "1
 * segment" (English cardinal plurals, Unicode CLDR: singular for exactly one; tests/REFERENCES.md,
 * "English plurals").
 */
import { afterAll, beforeAll, expect, test } from 'vitest';
import { Visitor, demo, signedIn, sql } from '../helpers/http';

let camera: Visitor;
let episodeId: string;

beforeAll(async () => {
	camera = await signedIn(demo.camera);
	const [channel] = await sql(`SELECT id FROM channel WHERE name = 'Torquehaven Garage'`);
	const slug = `counted-words-test-${Date.now()}`;
	[{ id: episodeId }] = await sql(
		`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate, stage) VALUES ($1, 'Counted words test', $2, 600, '29.97', 'shoot') RETURNING id`,
		[channel.id, slug]
	);
	const [segment] = await sql(
		`INSERT INTO segment (episode_id, position, kind, title) VALUES ($1, 1, 'install-step', 'Torque the U-bolts') RETURNING id`,
		[episodeId]
	);
	// A segment as the rundown makes it, with its (empty) script.
	await sql(`INSERT INTO segment_script (segment_id, body) VALUES ($1, '')`, [segment.id]);
	await sql(`INSERT INTO shot (segment_id, what, position) VALUES ($1, 'Close-up', 1)`, [
		segment.id
	]);
	await sql(
		`INSERT INTO footage (channel_id, episode_id, upload_id, purpose, clip_name, file_name, file_type, size_bytes, sha256) VALUES ($1, $2, $3, 'footage', 'ACAM_1001', 'ACAM_1001.mov', 'video/quicktime', 1000, $4)`,
		[channel.id, episodeId, `counted-${Date.now()}`, 'a'.repeat(64)]
	);
});

afterAll(async () => {
	await sql(`DELETE FROM footage WHERE episode_id = $1`, [episodeId]);
	await sql(`DELETE FROM episode WHERE slug LIKE 'counted-words-test-%'`);
});

/** The page's text with tags and comments taken out and white space squeezed, as a reader sees it. */
async function textOf(path: string): Promise<string> {
	const response = await camera.request(path);
	expect(response.status).toBe(200);
	return (await response.text())
		.replace(/<!--[\s\S]*?-->/g, '')
		.replace(/<[^>]+>/g, ' ')
		.replace(/\s+/g, ' ');
}

test('one shot in a segment reads "0 of 1 shot has a good take"', async () => {
	expect(await textOf(`/episodes/${episodeId}/shots`)).toContain(
		'0 of 1 shot has a good take with footage'
	);
});

test('one uploaded file reads "1 file"', async () => {
	const text = await textOf(`/episodes/${episodeId}/footage`);
	expect(text).toMatch(/\b1 file ·/);
});

test('one segment in the rundown reads "1 segment"', async () => {
	const text = await textOf(`/episodes/${episodeId}/rundown`);
	expect(text).toMatch(/\b1 segment ·/);
	expect(text).toMatch(/\b0 words\b/);
});
