/**
 * The shot list shows which takes still have no clip: each such take carries a "no clip yet" mark
 * and the list's header counts them, over the whole list; linking an uploaded clip clears both.
 * Counted words follow English plural rules (Unicode CLDR, English cardinal: "one" only for 1).
 */
import { createReadStream, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { randomBytes } from 'node:crypto';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, expect, inject, test } from 'vitest';
import * as tus from 'tus-js-client';
import { Visitor, demo, signedIn, sql } from '../helpers/http';

let camera: Visitor;
let producer: Visitor;
let episodeId = '';
const work = mkdtempSync(path.join(tmpdir(), 'wrenchroll-no-clip-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

async function uploadClip(visitor: Visitor, name: string): Promise<string> {
	const file = path.join(work, name);
	writeFileSync(file, randomBytes(128 * 1024));
	const upload = await new Promise<tus.Upload>((resolve, reject) => {
		const u = new tus.Upload(createReadStream(file), {
			endpoint: `${inject('baseUrl')}/api/uploads`,
			chunkSize: 1024 * 1024,
			headers: { cookie: visitor.cookieHeader(), origin: inject('baseUrl') },
			metadata: { filename: name, filetype: 'video/mp4', episodeId, cameraLabel: 'A cam' },
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

/** The shot list page as HTML: its header line and how many takes carry the mark. */
async function shotList(visitor: Visitor) {
	const response = await visitor.request(`/episodes/${episodeId}/shots`);
	expect(response.status).toBe(200);
	const html = await response.text();
	const header = html.match(/data-testid="takes-without-clip"[^>]*>([\s\S]*?)<\/p>/)?.[1] ?? '';
	return {
		header: header
			.replace(/<!--[\s\S]*?-->/g, '')
			.replace(/\s+/g, ' ')
			.trim(),
		marks: html.match(/data-testid="no-clip"/g)?.length ?? 0
	};
}

beforeAll(async () => {
	camera = await signedIn(demo.camera);
	producer = await signedIn(demo.producer);
	const [mika] = await sql(`SELECT id FROM person WHERE email = $1`, [demo.camera]);
	const created = await producer.api('/api/episodes', {
		method: 'POST',
		json: {
			title: `No clip yet ${Date.now()}`,
			targetRuntimeSeconds: 300,
			frameRate: '25',
			assignments: { camera: mika.id }
		}
	});
	episodeId = created.body.episode.id;
});

test('takes without a linked clip are marked and counted in the header; linking one clears its mark', async () => {
	expect(await shotList(camera)).toEqual({ header: 'No takes logged yet', marks: 0 });

	const segment = await producer.api(`/api/episodes/${episodeId}/segments`, {
		method: 'POST',
		json: { kind: 'install-step', title: 'Fit the lift blocks', plannedSeconds: 60 }
	});
	const segmentId = segment.body.segment.id;
	const shot = await camera.api(`/api/segments/${segmentId}/shots`, {
		method: 'POST',
		json: { what: 'Wide: block seated on the axle pad', roll: 'A' }
	});
	const takes = [];
	for (const [clipName, sourceIn, sourceOut] of [
		['ACAM_2001', '10:00:00:00', '10:00:10:00'],
		['ACAM_2002', '10:00:20:00', '10:00:30:00'],
		['ACAM_2003', '10:00:40:00', '10:00:50:00']
	]) {
		const logged = await camera.api(`/api/shots/${shot.body.shot.id}/takes`, {
			method: 'POST',
			json: { clipName, sourceIn, sourceOut, good: true }
		});
		expect(logged.status).toBe(201);
		takes.push(logged.body.take);
	}
	expect(await shotList(camera)).toEqual({ header: '3 takes have no clip yet', marks: 3 });

	const clipId = await uploadClip(camera, 'ACAM_2002.mp4');
	const linked = await camera.api(`/api/takes/${takes[1].id}`, {
		method: 'PATCH',
		json: { footageId: clipId, version: takes[1].version }
	});
	expect(linked.status).toBe(200);
	expect(await shotList(camera)).toEqual({ header: '2 takes have no clip yet', marks: 2 });

	// The read-only view (the host) shows the same marks and count.
	expect(await shotList(await signedIn(demo.host))).toEqual({
		header: '2 takes have no clip yet',
		marks: 2
	});

	for (const take of [takes[0], takes[2]]) {
		const other = await uploadClip(camera, `${take.clipName}.mp4`);
		expect(
			(
				await camera.api(`/api/takes/${take.id}`, {
					method: 'PATCH',
					json: { footageId: other, version: take.version }
				})
			).status
		).toBe(200);
	}
	expect(await shotList(camera)).toEqual({ header: 'Every take has its clip', marks: 0 });
});
