/**
 * In a real browser: the producer has the submitted script open; the host changes it meanwhile.
 * Approve is refused (409 Conflict, RFC 9110 §15.5.10: the request conflicts with the current state),
 * the page loads the new text by itself, and the next Approve goes through for the text on screen.
 */
import { afterAll, beforeAll, expect, test } from 'vitest';
import { openBrowser, signInAs, type BrowserSession } from '../helpers/browser';
import { demo, signedIn, sql } from '../helpers/http';

let browser: BrowserSession;
let episodeId: string;
let segmentId: string;

beforeAll(async () => {
	const producer = await signedIn(demo.producer);
	const host = await signedIn(demo.host);
	const created = await producer.api('/api/episodes', {
		method: 'POST',
		json: { title: `Approval race ${Date.now()}`, targetRuntimeSeconds: 600, frameRate: '29.97' }
	});
	episodeId = created.body.episode.id;
	const segment = await host.api(`/api/episodes/${episodeId}/segments`, {
		method: 'POST',
		json: { kind: 'overview', title: 'What we fit today', plannedSeconds: 60 }
	});
	segmentId = segment.body.segment.id;
	await host.api(`/api/segments/${segmentId}/script`, {
		method: 'PUT',
		json: {
			body: 'First draft of the intro, long enough to read out loud on camera.',
			version: segment.body.segment.script.version
		}
	});
	expect(
		(
			await host.api(`/api/episodes/${episodeId}/script-review`, {
				method: 'POST',
				json: { action: 'submit' }
			})
		).status
	).toBe(200);
	browser = await openBrowser();
	await signInAs(browser.page, demo.producer);
});

afterAll(async () => {
	await browser?.close();
	await sql(`DELETE FROM episode WHERE id = $1`, [episodeId]);
});

test('a refused approval loads the changed text, and approving again approves what is on screen', async () => {
	const { page } = browser;
	await page.goto(`/episodes/${episodeId}/script`);
	expect(await page.locator('main').textContent()).toContain('First draft of the intro');

	// The host edits while the producer reads.
	const host = await signedIn(demo.host);
	const script = await host.api(`/api/segments/${segmentId}/script`);
	await host.api(`/api/segments/${segmentId}/script`, {
		method: 'PUT',
		json: {
			body: 'Second draft: the intro now names the lift kit and the cautions.',
			version: script.body.script.version
		}
	});

	await page.getByRole('button', { name: 'Approve this script' }).click();
	await expect
		.poll(() => page.locator('main').textContent())
		.toContain('The script changed while you were reading it');
	// The new text is on the page without a reload…
	await expect
		.poll(() => page.locator('main').textContent())
		.toContain('Second draft: the intro now names the lift kit');
	// …so the next Approve is for it, and goes through.
	await page.getByRole('button', { name: 'Approve this script' }).click();
	await expect
		.poll(
			async () =>
				(await sql(`SELECT script_status FROM episode WHERE id = $1`, [episodeId]))[0].script_status
		)
		.toBe('approved');
});
