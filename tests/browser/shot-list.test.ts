/**
 * The shot list in a real browser: after the camera operator logs a take, the Log take form is
 * ready for the next take of the same shot (fields empty, the shot kept), so a take is not logged
 * twice by pressing the button again. A take with no clip linked is marked, and counted at the top.
 */
import { afterAll, beforeAll, expect, test } from 'vitest';
import { openBrowser, signInAs, type BrowserSession } from '../helpers/browser';
import { demo, sql } from '../helpers/http';

let session: BrowserSession;
let episodeId: string;
let shotId: string;

beforeAll(async () => {
	const [channel] = await sql(`SELECT id FROM channel WHERE name = 'Torquehaven Garage'`);
	const slug = `shot-list-test-${Date.now()}`;
	[{ id: episodeId }] = await sql(
		`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate, stage) VALUES ($1, 'Shot list test', $2, 600, '29.97', 'shoot') RETURNING id`,
		[channel.id, slug]
	);
	const [segment] = await sql(
		`INSERT INTO segment (episode_id, position, kind, title) VALUES ($1, 1, 'install-step', 'Torque the U-bolts') RETURNING id`,
		[episodeId]
	);
	[{ id: shotId }] = await sql(
		`INSERT INTO shot (segment_id, what, position) VALUES ($1, 'Close-up: torque wrench', 1) RETURNING id`,
		[segment.id]
	);
	session = await openBrowser();
	await signInAs(session.page, demo.camera);
});

afterAll(async () => {
	await session?.close();
	await sql(`DELETE FROM episode WHERE slug LIKE 'shot-list-test-%'`);
});

test('after a take is logged the Log take form empties its fields and keeps the shot', async () => {
	const page = session.page;
	await page.goto(`/episodes/${episodeId}/shots`);
	const form = page.locator('form[action="?/logTake"]');
	await form.getByLabel('Clip').fill('ACAM_1001');
	await form.getByLabel('Source in').fill('01:00:00:00');
	await form.getByLabel('Source out').fill('01:00:12:00');
	await form.getByLabel('Good').check();
	await form.getByRole('button', { name: 'Log take' }).click();
	await expect
		.poll(() => page.getByRole('list', { name: 'Takes of this shot' }).textContent())
		.toContain('ACAM_1001');
	// No clip is linked yet: the take says so, and the list's header counts it.
	const take = page.getByTestId('take').filter({ hasText: 'ACAM_1001' });
	await expect.poll(() => take.getByTestId('no-clip').isVisible()).toBe(true);
	expect(await take.getByTestId('no-clip').textContent()).toBe('no clip yet');
	await expect
		.poll(() => page.getByTestId('takes-without-clip').innerText())
		.toBe('1 take has no clip yet');
	await expect.poll(() => form.getByLabel('Clip').inputValue()).toBe('');
	expect(await form.getByLabel('Source in').inputValue()).toBe('');
	expect(await form.getByLabel('Source out').inputValue()).toBe('');
	expect(await form.getByLabel('Good').isChecked()).toBe(false);
	expect(await form.locator('input[name="shotId"]').inputValue()).toBe(shotId);
	// The next take goes to the same shot.
	await form.getByLabel('Clip').fill('ACAM_1002');
	await form.getByLabel('Source in').fill('01:00:20:00');
	await form.getByLabel('Source out').fill('01:00:30:00');
	await form.getByRole('button', { name: 'Log take' }).click();
	await expect
		.poll(async () =>
			(await sql(`SELECT clip_name FROM take WHERE shot_id = $1 ORDER BY clip_name`, [shotId])).map(
				(row) => row.clip_name
			)
		)
		.toEqual(['ACAM_1001', 'ACAM_1002']);
});

test('a refused take keeps what was typed so it can be corrected', async () => {
	const page = session.page;
	await page.goto(`/episodes/${episodeId}/shots`);
	const form = page.locator('form[action="?/logTake"]');
	await form.getByLabel('Clip').fill('ACAM_1009');
	await form.getByLabel('Source in').fill('01:00:10:00');
	await form.getByLabel('Source out').fill('not a time');
	await form.getByRole('button', { name: 'Log take' }).click();
	await expect.poll(() => form.locator('.field-error').count()).toBeGreaterThan(0);
	expect(await form.getByLabel('Clip').inputValue()).toBe('ACAM_1009');
	expect(await form.getByLabel('Source out').inputValue()).toBe('not a time');
});
