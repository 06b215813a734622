/**
 * Logging takes against shots over HTTP, and the shoot → edit gate reading them: a shot passes once
 * it has a good take linked to an uploaded clip. Source timecode is typed at the episode's rate and
 * read with the SMPTE ST 12-1 timecode module (drop-frame ';' at 29.97).
 */
import { createReadStream, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { randomBytes } from 'node:crypto';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, inject, test } from 'vitest';
import * as tus from 'tus-js-client';
import { Visitor, demo, signedIn, sql } from '../helpers/http';

let camera: Visitor;
let episodeId = '';
let shotId = '';
const work = mkdtempSync(path.join(tmpdir(), 'wrenchroll-takes-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

async function uploadClip(visitor: Visitor, name: string, forEpisode: string): Promise<string> {
	const file = path.join(work, name);
	writeFileSync(file, randomBytes(256 * 1024));
	const upload = await new Promise<tus.Upload>((resolve, reject) => {
		const u = new tus.Upload(createReadStream(file), {
			endpoint: `${inject('baseUrl')}/api/uploads`,
			chunkSize: 1024 * 1024,
			headers: { cookie: visitor.cookieHeader(), origin: inject('baseUrl') },
			metadata: {
				filename: name,
				filetype: 'video/mp4',
				episodeId: forEpisode,
				cameraLabel: 'A cam'
			},
			onError: reject,
			onSuccess: () => resolve(u)
		});
		u.start();
	});
	const [row] = await sql(`SELECT id FROM footage WHERE upload_id = $1`, [
		upload.url!.split('/').pop()
	]);
	return row.id;
}

beforeAll(async () => {
	camera = await signedIn(demo.camera);
	// A fresh episode at 29.97 with one segment that needs footage and one planned shot.
	const producer = await signedIn(demo.producer);
	const [mika] = await sql(`SELECT id FROM person WHERE email = $1`, [demo.camera]);
	const [jules] = await sql(`SELECT id FROM person WHERE email = $1`, [demo.editor]);
	const created = await producer.api('/api/episodes', {
		method: 'POST',
		json: {
			title: `Takes test ${Date.now()}`,
			targetRuntimeSeconds: 300,
			frameRate: '29.97',
			assignments: { camera: mika.id, editor: jules.id }
		}
	});
	episodeId = created.body.episode.id;
	const segment = await producer.api(`/api/episodes/${episodeId}/segments`, {
		method: 'POST',
		json: { kind: 'install-step', title: 'Torque the U-bolts', plannedSeconds: 60 }
	});
	const shot = await camera.api(`/api/segments/${segment.body.segment.id}/shots`, {
		method: 'POST',
		json: { what: 'Close-up: torque wrench on the U-bolt nut', roll: 'A' }
	});
	shotId = shot.body.shot.id;
	await sql(`UPDATE episode SET stage = 'shoot' WHERE id = $1`, [episodeId]);
});

const reasons = async () =>
	(await camera.api(`/api/episodes/${episodeId}/stage`)).body.reasons.map(
		(r: { rule: string }) => r.rule
	);

describe('takes and the shoot gate', () => {
	test('a take is logged with drop-frame source timecode stored as frames (SMPTE ST 12-1: 00:01:00;02 is frame 1800)', async () => {
		expect(await reasons()).toContain('take-missing');
		const logged = await camera.api(`/api/shots/${shotId}/takes`, {
			method: 'POST',
			json: {
				clipName: 'ACAM_1001',
				sourceIn: '00:01:00;02',
				sourceOut: '00:01:10;00',
				good: false
			}
		});
		expect(logged.status).toBe(201);
		expect(logged.body.take.sourceInFrames).toBe(1800);
		// 00:01:10;00 → (70 s × 30) − 2 × (1 − 0) = 2098 frames by the drop-frame formula
		// (tests/REFERENCES.md, "Timecode").
		expect(logged.body.take.sourceOutFrames).toBe(2098);
		expect(await reasons()).toContain('take-missing'); // logged, but not marked good
	});

	test('a good take without footage still holds the gate; linking its uploaded clip clears it', async () => {
		const good = await camera.api(`/api/shots/${shotId}/takes`, {
			method: 'POST',
			json: { clipName: 'ACAM_1002', sourceIn: '00:02:00:00', sourceOut: '00:02:20:00', good: true }
		});
		expect(good.status).toBe(201);
		expect(await reasons()).toContain('footage-missing');
		const clipId = await uploadClip(camera, 'ACAM_1002.mp4', episodeId);
		const linked = await camera.api(`/api/takes/${good.body.take.id}`, {
			method: 'PATCH',
			json: { footageId: clipId, version: good.body.take.version }
		});
		expect(linked.status).toBe(200);
		const after = await reasons();
		expect(after).not.toContain('footage-missing');
		expect(after).not.toContain('take-missing');
		const stale = await camera.api(`/api/takes/${good.body.take.id}`, {
			method: 'PATCH',
			json: { good: false, version: good.body.take.version }
		});
		expect(stale.status).toBe(409);
	});
});

describe('bad takes are refused in plain words and store nothing', () => {
	test('an out point before the in point, a dropped label, and a clip from another episode', async () => {
		const before = (await sql(`SELECT count(*)::int AS n FROM take`))[0].n;
		const backwards = await camera.api(`/api/shots/${shotId}/takes`, {
			method: 'POST',
			json: { clipName: 'A002', sourceIn: '00:05:00:00', sourceOut: '00:04:00:00' }
		});
		expect(backwards.status).toBe(400);
		expect(backwards.body.issues.sourceOut[0]).toMatch(
			/Make the out point later than the in point/
		);
		const dropped = await camera.api(`/api/shots/${shotId}/takes`, {
			method: 'POST',
			json: { clipName: 'A002', sourceIn: '00:01:00;00', sourceOut: '00:02:00;02' }
		});
		expect(dropped.status).toBe(400);
		expect(dropped.body.issues.sourceIn[0]).toMatch(/doesn't exist in drop-frame/);
		const [other] = await sql(
			`SELECT f.id FROM footage f JOIN episode e ON e.id = f.episode_id WHERE e.id <> $1 AND f.channel_id = (SELECT channel_id FROM episode WHERE id = $1) LIMIT 1`,
			[episodeId]
		);
		const foreign = await camera.api(`/api/shots/${shotId}/takes`, {
			method: 'POST',
			json: {
				clipName: 'A003',
				sourceIn: '00:03:00:00',
				sourceOut: '00:03:05:00',
				footageId: other.id
			}
		});
		expect(foreign.status).toBe(400);
		expect((await sql(`SELECT count(*)::int AS n FROM take`))[0].n).toBe(before);
	});

	test('roles: the host and merch team may not log takes, signed out is 401, another channel gets 404', async () => {
		const body = {
			json: { clipName: 'X', sourceIn: '00:00:01:00', sourceOut: '00:00:02:00' },
			method: 'POST'
		};
		expect((await (await signedIn(demo.host)).api(`/api/shots/${shotId}/takes`, body)).status).toBe(
			403
		);
		expect(
			(await (await signedIn(demo.merch)).api(`/api/shots/${shotId}/takes`, body)).status
		).toBe(403);
		expect((await new Visitor().api(`/api/shots/${shotId}/takes`, body)).status).toBe(401);
		expect(
			(await (await signedIn(demo.otherProducer)).api(`/api/shots/${shotId}/takes`, body)).status
		).toBe(404);
	});

	test('the shot list page works without JavaScript: a take logged by form keeps the typed values on error', async () => {
		const result = await camera.action(`/episodes/${episodeId}/shots?/logTake`, {
			shotId,
			clipName: 'B001',
			sourceIn: 'ten past',
			sourceOut: '00:00:05:00'
		});
		expect(result.status).toBe(400);
		expect(result.data.values.clipName).toBe('B001');
		expect(result.data.errors.sourceIn[0]).toBeTruthy();
	});
});

describe('the shot list carries the cautions', () => {
	test('a segment flagged "vehicle raised on stands" shows its caution card text where the shots are planned', async () => {
		// The product owner's rule: where work shown can hurt someone, the usual cautions are shown.
		const [row] = await sql(
			`SELECT e.id AS episode_id, c.text FROM caution c JOIN segment s ON s.id = c.segment_id JOIN episode e ON e.id = s.episode_id
			 JOIN channel ch ON ch.id = e.channel_id WHERE ch.name = 'Torquehaven Garage' AND c.hazard = 'raised-vehicle' LIMIT 1`
		);
		const operator = await signedIn(demo.camera);
		const html = await (await operator.request(`/episodes/${row.episode_id}/shots`)).text();
		expect(html).toContain('Cautions for this segment');
		expect(html).toContain('Vehicle raised on stands');
		// Svelte escapes text for HTML, so compare with the same escaping of the stored words.
		expect(html).toContain(row.text.replace(/&/g, '&amp;').replace(/</g, '&lt;'));
	});
});

describe('the script pages carry the cautions and the producer’s comments', () => {
	test('a hazardous segment’s editor shows its caution card and the line that defers to licensed practice', async () => {
		const [row] = await sql(
			`SELECT e.id AS episode_id, s.id AS segment_id, c.text FROM caution c JOIN segment s ON s.id = c.segment_id JOIN episode e ON e.id = s.episode_id
			 JOIN channel ch ON ch.id = e.channel_id WHERE ch.name = 'Torquehaven Garage' AND c.hazard = 'raised-vehicle' LIMIT 1`
		);
		const host = await signedIn(demo.host);
		const editor = await (
			await host.request(`/episodes/${row.episode_id}/script/${row.segment_id}`)
		).text();
		expect(editor).toContain('Cautions for this segment');
		expect(editor).toContain(row.text.replace(/&/g, '&amp;').replace(/</g, '&lt;'));
		expect(editor).toContain('licensed staff');
		const whole = await (await host.request(`/episodes/${row.episode_id}/script`)).text();
		expect(whole).toContain('licensed staff');
		const rundown = await (await host.request(`/episodes/${row.episode_id}/rundown`)).text();
		expect(rundown).toContain('licensed staff');
	});

	test('a comment the producer left on a segment shows in that segment’s editor', async () => {
		const [segment] = await sql(
			`SELECT s.id, s.episode_id FROM segment s JOIN episode e ON e.id = s.episode_id JOIN channel ch ON ch.id = e.channel_id WHERE ch.name = 'Torquehaven Garage' AND e.stage = 'script' ORDER BY s.position LIMIT 1`
		);
		const producer = await signedIn(demo.producer);
		const note = `Say the torque figure twice ${Date.now()}`;
		const commented = await producer.api(`/api/episodes/${segment.episode_id}/script-review`, {
			method: 'POST',
			json: { action: 'comment', body: note, segmentId: segment.id }
		});
		expect(commented.status).toBe(200);
		const host = await signedIn(demo.host);
		const page = await (
			await host.request(`/episodes/${segment.episode_id}/script/${segment.id}`)
		).text();
		expect(page).toContain('Comments on this segment');
		expect(page).toContain(note);
	});
});

describe('tyre mounting and road tests are hazards too', () => {
	test('a segment flagged for tyre inflation and a road test gets both caution cards (migration 12 allows them)', async () => {
		const producer = await signedIn(demo.producer);
		const host = await signedIn(demo.host);
		const created = await producer.api('/api/episodes', {
			method: 'POST',
			json: { title: `Hazards ${Date.now()}`, targetRuntimeSeconds: 600, frameRate: '29.97' }
		});
		const segment = await host.api(`/api/episodes/${created.body.episode.id}/segments`, {
			method: 'POST',
			json: {
				kind: 'install-step',
				title: 'Seat the beads, then drive it',
				plannedSeconds: 90,
				hazards: ['tyre-inflation', 'road-test']
			}
		});
		expect(segment.status).toBe(201);
		const cautions = segment.body.segment.cautions as { hazard: string; text: string }[];
		expect(cautions.map((caution) => caution.hazard).sort()).toEqual([
			'road-test',
			'tyre-inflation'
		]);
		expect(cautions.find((caution) => caution.hazard === 'tyre-inflation')!.text).toMatch(
			/tyre cage/
		);
		await sql(`DELETE FROM episode WHERE id = $1`, [created.body.episode.id]);
	});
});
