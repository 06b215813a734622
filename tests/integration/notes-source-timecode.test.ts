/**
 * A note's source time reads and shows the way the take's camera showed it: a take logged in
 * drop-frame (";") keeps drop-frame labels on the notes page, and a note time is typed in the
 * take's own form.
 *
 * Outside source: SMPTE ST 12-1 drop-frame counting at 29.97 (the spec is paywalled; frame counts
 * come from the npm package `smpte-timecode`, tests/REFERENCES.md "Timecode").
 */
import { createRequire } from 'node:module';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { Visitor, demo, signedIn, sql } from '../helpers/http';

const require = createRequire(import.meta.url);
const smpte = require('smpte-timecode') as (
	timecode: string,
	rate: [number, number],
	dropFrame: boolean
) => { frameCount: number };
const dropFrames = (label: string) => smpte(label, [30000, 1001], true).frameCount;
const nonDropFrames = (label: string) => smpte(label, [30000, 1001], false).frameCount;

let camera: Visitor;
let episodeId: string;
let dropTakeId: string;
let nonDropTakeId: string;

beforeAll(async () => {
	const channelId = (await sql(`SELECT id FROM channel WHERE name = 'Torquehaven Garage'`))[0].id;
	camera = await signedIn(demo.camera);
	const slug = `source-tc-test-${Date.now()}`;
	const [episode] = await sql(
		`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate, stage) VALUES ($1, 'Source timecode test', $2, 600, '29.97', 'shoot') RETURNING id`,
		[channelId, slug]
	);
	episodeId = episode.id;
	const [segment] = await sql(
		`INSERT INTO segment (episode_id, position, kind, title) VALUES ($1, 1, 'install-step', 'Step 1') RETURNING id`,
		[episodeId]
	);
	await sql(`INSERT INTO segment_script (segment_id, body) VALUES ($1, '')`, [segment.id]);
	const [shot] = await sql(
		`INSERT INTO shot (segment_id, what, position) VALUES ($1, 'Close-up', 1) RETURNING id`,
		[segment.id]
	);
	// Logged as the shot list does: drop-frame labels 08:01:10;00 → 08:01:30;00.
	const [dropTake] = await sql(
		`INSERT INTO take (shot_id, clip_name, source_in_frames, source_out_frames, source_drop_frame, good) VALUES ($1, 'BCAM_1007', $2, $3, true, true) RETURNING id`,
		[shot.id, dropFrames('08:01:10;00'), dropFrames('08:01:30;00')]
	);
	dropTakeId = dropTake.id;
	const [nonDropTake] = await sql(
		`INSERT INTO take (shot_id, clip_name, source_in_frames, source_out_frames, source_drop_frame, good) VALUES ($1, 'BCAM_1008', $2, $3, false, true) RETURNING id`,
		[shot.id, nonDropFrames('08:01:10:00'), nonDropFrames('08:01:30:00')]
	);
	nonDropTakeId = nonDropTake.id;
});

afterAll(async () => {
	await sql(`DELETE FROM episode WHERE slug LIKE 'source-tc-test-%'`);
});

const writeNote = (json: Record<string, unknown>) =>
	camera.api(`/api/episodes/${episodeId}/notes`, {
		method: 'POST',
		json: { text: 'Jack stand under the pinch weld', ...json }
	});

describe('source timecode in the take’s own form', () => {
	test('the take picker lists a drop-frame take with the labels it was logged with', async () => {
		const found = await camera.api(`/api/episodes/${episodeId}/takes/picker?q=BCAM_100`);
		expect(found.status).toBe(200);
		const take = found.body.items.find((t: { id: string }) => t.id === dropTakeId);
		expect(take).toMatchObject({ sourceIn: '08:01:10;00', sourceOut: '08:01:30;00' });
		const nonDrop = found.body.items.find((t: { id: string }) => t.id === nonDropTakeId);
		expect(nonDrop).toMatchObject({ sourceIn: '08:01:10:00', sourceOut: '08:01:30:00' });
	});

	test('a note shows its take’s in and out with the labels the take was logged with', async () => {
		const answer = await writeNote({ takeId: dropTakeId, sourceTime: '08:01:12;00' });
		expect(answer.status, JSON.stringify(answer.body)).toBe(201);
		const page = await camera.api(`/api/episodes/${episodeId}/notes`);
		const shown = page.body.notes.find((n: { id: string }) => n.id === answer.body.note.id);
		expect(shown).toMatchObject({ takeSourceIn: '08:01:10;00', takeSourceOut: '08:01:30;00' });
	});

	test('a note typed in drop-frame on a drop-frame take shows the same label back', async () => {
		const answer = await writeNote({ takeId: dropTakeId, sourceTime: '08:01:15;00' });
		expect(answer.status, JSON.stringify(answer.body)).toBe(201);
		expect(answer.body.note.sourceFrame).toBe(dropFrames('08:01:15;00'));
		expect(answer.body.note.sourceTimecode).toBe('08:01:15;00');
		const page = await camera.api(`/api/episodes/${episodeId}/notes`);
		const shown = page.body.notes.find((n: { id: string }) => n.id === answer.body.note.id);
		expect(shown.sourceTimecode).toBe('08:01:15;00');
	});

	test('a colon typed on a drop-frame take is read as the take’s drop-frame label', async () => {
		const answer = await writeNote({ takeId: dropTakeId, sourceTime: '08:01:15:00' });
		expect(answer.status, JSON.stringify(answer.body)).toBe(201);
		expect(answer.body.note.sourceFrame).toBe(dropFrames('08:01:15;00'));
		expect(answer.body.note.sourceTimecode).toBe('08:01:15;00');
	});

	test('a semicolon typed on a non-drop take is read as the take’s non-drop label', async () => {
		const answer = await writeNote({ takeId: nonDropTakeId, sourceTime: '08:01:15;00' });
		expect(answer.status, JSON.stringify(answer.body)).toBe(201);
		expect(answer.body.note.sourceFrame).toBe(nonDropFrames('08:01:15:00'));
		expect(answer.body.note.sourceTimecode).toBe('08:01:15:00');
	});

	test('a time outside the take is refused with the take’s range as it was logged', async () => {
		const answer = await writeNote({ takeId: dropTakeId, sourceTime: '08:02:00;02' });
		expect(answer.status).toBe(400);
		expect(answer.body.issues.sourceTime[0]).toMatch(
			/08:02:00;02 is outside take BCAM_1007 \(08:01:10;00–08:01:30;00\)/
		);
	});

	test('a label the take’s drop-frame count skips is refused with the take’s range', async () => {
		const answer = await writeNote({ takeId: dropTakeId, sourceTime: '08:02:00:00' });
		expect(answer.status).toBe(400);
		expect(answer.body.issues.sourceTime[0]).toMatch(/doesn't exist in drop-frame/);
		expect(answer.body.issues.sourceTime[0]).toMatch(/BCAM_1007 runs 08:01:10;00–08:01:30;00/);
	});
});
