/**
 * In a real browser: when the channel's storage quota is spoken for, the uploader says so in plain
 * words (the server's 413 body, tus 1.0.0 Creation) and does not retry a refusal that waiting
 * will not fix.
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { randomBytes } from 'node:crypto';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, expect, test } from 'vitest';
import { openBrowser, signInAs, type BrowserSession } from '../helpers/browser';
import { demo, signedIn, sql } from '../helpers/http';

const GB = 1e9;
let browser: BrowserSession;
const work = mkdtempSync(path.join(tmpdir(), 'wrenchroll-browser-quota-'));
const file = path.join(work, 'bay3-c-cam-0033.mp4');
writeFileSync(file, randomBytes(1024 * 1024));

beforeAll(async () => {
	browser = await openBrowser();
});
afterAll(async () => {
	await browser?.close();
	rmSync(work, { recursive: true, force: true });
});

test('an upload refused for the storage quota shows why and what to do, and is not retried', async () => {
	const [episode] = await sql(
		`SELECT id, channel_id FROM episode WHERE slug = 'mule-rear-block-lift'`
	);
	const [usage] = await sql(
		`SELECT (SELECT coalesce(sum(size_bytes), 0) FROM footage WHERE channel_id = $1)
		      + (SELECT coalesce(sum(size_bytes), 0) FROM upload WHERE channel_id = $1 AND completed_at IS NULL) AS used`,
		[episode.channel_id]
	);
	const used = Number(usage.used);
	const quotaGb = Math.ceil(used / GB) + 1;
	const producer = await signedIn(demo.producer);
	const camera = await signedIn(demo.camera);
	const { body } = await producer.api('/api/channel');
	const original = body.channel.storageQuotaGb ?? 2000;
	await producer.api('/api/channel', {
		method: 'PATCH',
		json: { ...body.channel, storageQuotaGb: quotaGb }
	});
	// Another upload, started and not finished, has spoken for all the room that is left.
	const b64 = (value: string) => Buffer.from(value).toString('base64');
	const pending = await camera.request('/api/uploads', {
		method: 'POST',
		headers: {
			'Tus-Resumable': '1.0.0',
			'Upload-Length': String(quotaGb * GB - used),
			'Upload-Metadata': `filename ${b64('bay3-a-cam-0032.mp4')},filetype ${b64('video/mp4')},episodeId ${b64(episode.id)}`
		}
	});
	const pendingUrl = pending.headers.get('location');
	try {
		const { page } = browser;
		let creations = 0;
		page.on('request', (request) => {
			if (request.method() === 'POST' && new URL(request.url()).pathname === '/api/uploads')
				creations++;
		});
		await signInAs(page, demo.camera);
		await page.goto(`/episodes/${episode.id}/footage`);
		await page.getByTestId('upload-input').setInputFiles(file);
		const row = page.getByTestId('upload-row');
		await expect.poll(() => row.getAttribute('data-state'), { timeout: 20_000 }).toBe('failed');
		const text = await row.innerText();
		expect(text).toMatch(/storage quota/i);
		expect(text).toMatch(/Channel settings/);
		// Failed is final (tus-js-client gave up): one creation, no retries of a refusal.
		expect(creations).toBe(1);
	} finally {
		if (pendingUrl)
			await camera.request(pendingUrl, { method: 'DELETE', headers: { 'Tus-Resumable': '1.0.0' } });
		const { body: now } = await producer.api('/api/channel');
		await producer.api('/api/channel', {
			method: 'PATCH',
			json: { ...now.channel, storageQuotaGb: original }
		});
	}
});
