/**
 * Picture lock fixes the approved version (issue: cut review). A cut upload refused at creation once
 * the episode is locked is covered in cut-review.test.ts; this is the other order: an upload
 * created while the episode is in edit, whose last bytes arrive after the producer locked it.
 * Its bytes are kept (nothing a crew member sent is lost), but it does not become a version, so
 * the approved version stays the current one.
 *
 * Protocol: tus 1.0.0 core and Creation (POST with Upload-Length and Upload-Metadata, then one
 * PATCH from offset 0 with Content-Type application/offset+octet-stream).
 */
import { randomBytes } from 'node:crypto';
import { afterAll, beforeAll, expect, inject, test } from 'vitest';
import { demo, signedIn, sql, type Visitor } from '../helpers/http';
import { approvedCutFixture } from '../helpers/cut-review';

const TUS = { 'Tus-Resumable': '1.0.0' };
const b64 = (value: string) => Buffer.from(value).toString('base64');
let producer: Visitor;
let episodeId = '';

beforeAll(async () => {
	producer = await signedIn(demo.producer);
	const [channel] = await sql(`SELECT id FROM channel WHERE name = 'Torquehaven Garage'`);
	[{ id: episodeId }] = await sql(
		`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate, stage, cut_duration_frames)
		 VALUES ($1, 'Lock race test', $2, 600, '25', 'edit', 250) RETURNING id`,
		[channel.id, `cut-lock-race-${Date.now()}`]
	);
	await approvedCutFixture(episodeId);
});

afterAll(async () => {
	await sql(`DELETE FROM episode WHERE slug LIKE 'cut-lock-race-%'`);
});

test('a cut whose upload finishes after picture lock is kept as a file but is not a new version', async () => {
	const base = inject('baseUrl');
	const bytes = randomBytes(64 * 1024);
	const metadata = Object.entries({
		filename: 'CUT_LATE.mp4',
		filetype: 'video/mp4',
		episodeId,
		purpose: 'cut',
		clipName: 'CUT_LATE',
		changeNote: 'Late trim of the outro'
	})
		.map(([key, value]) => `${key} ${b64(value)}`)
		.join(',');
	const created = await fetch(`${base}/api/uploads`, {
		method: 'POST',
		headers: {
			...TUS,
			cookie: producer.cookieHeader(),
			origin: base,
			'Upload-Length': String(bytes.length),
			'Upload-Metadata': metadata
		}
	});
	expect(created.status).toBe(201);
	const location = new URL(created.headers.get('location')!, base).href;

	// The producer locks the picture while the bytes are still on their way.
	await sql(`UPDATE episode SET stage = 'locked' WHERE id = $1`, [episodeId]);

	const patched = await fetch(location, {
		method: 'PATCH',
		headers: {
			...TUS,
			cookie: producer.cookieHeader(),
			origin: base,
			'Upload-Offset': '0',
			'Content-Type': 'application/offset+octet-stream'
		},
		body: bytes
	});
	expect(patched.status).toBe(204);
	expect(patched.headers.get('upload-offset')).toBe(String(bytes.length));

	const kept = await sql(
		`SELECT id FROM footage WHERE episode_id = $1 AND clip_name = 'CUT_LATE' AND purpose = 'cut'`,
		[episodeId]
	);
	expect(kept).toHaveLength(1);
	const versions = await sql(
		`SELECT number, approval FROM cut_version WHERE episode_id = $1 ORDER BY number`,
		[episodeId]
	);
	expect(versions).toEqual([{ number: 1, approval: 'approved' }]);
});
