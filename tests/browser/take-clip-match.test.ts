/**
 * Linking a take to its uploaded clip by name: an upload named ACAM_1001.mp4 is offered, in one
 * click, to the take logged as ACAM_1001 (the file name without its extension, any case: cameras
 * name the file after the clip they show, which is common practice). Other clips are not offered.
 */
import { afterAll, beforeAll, expect, test } from 'vitest';
import { openBrowser, signInAs, type BrowserSession } from '../helpers/browser';
import { demo, sql } from '../helpers/http';

let session: BrowserSession;
let episodeId: string;
let takeId: string;
let matchingId: string;

beforeAll(async () => {
	const [channel] = await sql(`SELECT id FROM channel WHERE name = 'Torquehaven Garage'`);
	[{ id: episodeId }] = await sql(
		`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate, stage)
		 VALUES ($1, 'Clip match test', $2, 600, '29.97', 'shoot') RETURNING id`,
		[channel.id, `clip-match-test-${Date.now()}`]
	);
	const [segment] = await sql(
		`INSERT INTO segment (episode_id, position, kind, title) VALUES ($1, 1, 'install-step', 'Torque the U-bolts') RETURNING id`,
		[episodeId]
	);
	const [shot] = await sql(
		`INSERT INTO shot (segment_id, what, position) VALUES ($1, 'Close-up: torque wrench', 1) RETURNING id`,
		[segment.id]
	);
	[{ id: takeId }] = await sql(
		`INSERT INTO take (shot_id, clip_name, source_in_frames, source_out_frames, good)
		 VALUES ($1, 'ACAM_1001', 107892, 108252, true) RETURNING id`,
		[shot.id]
	);
	const clip = (name: string, fileName: string) =>
		sql(
			`INSERT INTO footage (channel_id, episode_id, upload_id, purpose, clip_name, file_name, file_type, size_bytes, sha256)
			 VALUES ($1, $2, $3, 'footage', $4, $5, 'video/mp4', 16, $6) RETURNING id`,
			[
				channel.id,
				episodeId,
				`clip-match-${fileName}-${Date.now()}`,
				name,
				fileName,
				'c'.repeat(64)
			]
		);
	// The clip name typed at upload differs; the file name is what matches.
	[{ id: matchingId }] = await clip('Wrench close', 'acam_1001.MP4');
	await clip('ACAM_10012', 'ACAM_10012.mp4');
	await clip('BCAM_1001', 'BCAM_1001.mov');
	session = await openBrowser();
	await signInAs(session.page, demo.camera);
});

afterAll(async () => {
	await session?.close();
	await sql(`DELETE FROM episode WHERE slug LIKE 'clip-match-test-%'`);
});

test('an upload named like the take is offered as a one-click link, and the click links it', async () => {
	const page = session.page;
	await page.goto(`/episodes/${episodeId}/shots`);
	const take = page.getByTestId('take').filter({ hasText: 'ACAM_1001' });
	const offers = take.getByTestId('link-matching-clip');
	expect(await offers.allTextContents()).toEqual(['Link acam_1001.MP4']);
	await offers.click();
	await expect
		.poll(
			async () => (await sql(`SELECT footage_id FROM take WHERE id = $1`, [takeId]))[0].footage_id
		)
		.toBe(matchingId);
	// Once linked, the offer goes and the clip picker shows the link.
	await expect.poll(() => take.getByTestId('link-matching-clip').count()).toBe(0);
	expect(await take.getByLabel('Clip of ACAM_1001').inputValue()).toBe(matchingId);
});
