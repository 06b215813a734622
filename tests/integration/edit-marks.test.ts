/**
 * The edit timeline is fed by the other areas: an uploaded cut plays under it (served with HTTP
 * range requests, RFC 9110 §14), and placed cautions appear as marks at their frame.
 */
import { createReadStream, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { randomBytes } from 'node:crypto';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, expect, inject, test } from 'vitest';
import * as tus from 'tus-js-client';
import { demo, signedIn, sql } from '../helpers/http';

const work = mkdtempSync(path.join(tmpdir(), 'wrenchroll-cut-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

async function editorInTorquehaven() {
	const editor = await signedIn(demo.editor);
	const [channel] = await sql(`SELECT id FROM channel WHERE name = 'Torquehaven Garage'`);
	await editor.request('/channel?/switch', { method: 'POST', form: { channelId: channel.id } });
	return editor;
}

test('an uploaded cut becomes the video under the edit timeline, and placed cautions are marks', async () => {
	const editor = await editorInTorquehaven();
	const [episode] = await sql(`SELECT id FROM episode WHERE slug = 'mule-rear-block-lift'`);
	const file = path.join(work, 'mule-proxy.mp4');
	writeFileSync(file, randomBytes(2 * 1024 * 1024));
	await new Promise<void>((resolve, reject) =>
		new tus.Upload(createReadStream(file), {
			endpoint: `${inject('baseUrl')}/api/uploads`,
			chunkSize: 1024 * 1024,
			headers: { cookie: editor.cookieHeader(), origin: inject('baseUrl') },
			metadata: {
				filename: 'mule-proxy.mp4',
				filetype: 'video/mp4',
				episodeId: episode.id,
				purpose: 'cut'
			},
			onError: reject,
			onSuccess: () => resolve()
		}).start()
	);
	const [cut] = await sql(
		`SELECT id FROM footage WHERE episode_id = $1 AND purpose = 'cut' ORDER BY created_at DESC LIMIT 1`,
		[episode.id]
	);

	const [caution] = await sql(
		`SELECT c.id, s.title AS text FROM caution c JOIN segment s ON s.id = c.segment_id WHERE s.episode_id = $1 AND c.hazard = ANY(s.hazards) ORDER BY s.position LIMIT 1`,
		[episode.id]
	);
	await sql(`UPDATE caution SET at_frame = 1800 WHERE id = $1`, [caution.id]);

	const data = await editor.api(`/episodes/${episode.id}/edit/__data.json`);
	expect(data.status).toBe(200);
	const text = JSON.stringify(data.body);
	expect(text).toContain(`/api/footage/${cut.id}/file`);
	expect(text).toContain(caution.text.slice(0, 30)); // the mark names the segment
	expect(text).toContain('spec-card'); // the demo lift and torque cards are placed on this cut

	const head = await editor.request(`/api/footage/${cut.id}/file`, {
		headers: { range: 'bytes=0-1023' }
	});
	expect(head.status).toBe(206);
	expect(head.headers.get('accept-ranges')).toBe('bytes');
});
