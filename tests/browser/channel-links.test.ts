/**
 * In a real browser: the demo editor, who works in two channels, opens a link to an episode of the
 * channel that isn't current, by loading the address (a mailed link) and by following a link inside
 * the app (client-side navigation). Both open the episode in its channel: the top bar's picker shows
 * that channel and the page says it switched. Access rule: OWASP ASVS 4.0 V4 (the server decides).
 */
import { afterAll, beforeAll, expect, test } from 'vitest';
import { openBrowser, signInAs, switchChannel, type BrowserSession } from '../helpers/browser';
import { demo, sql } from '../helpers/http';

let browser: BrowserSession;
let episode: { id: string; title: string };

beforeAll(async () => {
	browser = await openBrowser();
	[episode] = await sql(
		`SELECT e.id, e.title FROM episode e JOIN channel c ON c.id = e.channel_id
		 WHERE c.name = 'Torquehaven Garage' ORDER BY e.created_at LIMIT 1`
	);
});

afterAll(async () => {
	await browser?.close();
	// Other test files sign the editor in expecting the first channel by name.
	await sql(`UPDATE person SET last_channel_id = NULL WHERE email = $1`, [demo.editor]);
});

const pickedChannel = () =>
	browser.page
		.getByLabel('Channel')
		.evaluate((select: HTMLSelectElement) => select.selectedOptions[0]?.textContent?.trim());

test('a mailed link to an episode of the other channel opens it there and says so', async () => {
	const { page } = browser;
	await signInAs(page, demo.editor);
	await switchChannel(page, 'Dune Wagon Weekly');
	const response = await page.goto(`/episodes/${episode.id}`);
	expect(response?.status()).toBe(200);
	expect(new URL(page.url()).searchParams.get('switched')).not.toBeNull();
	await expect
		.poll(() => page.getByRole('status').first().textContent())
		.toContain('Switched to Torquehaven Garage to open this episode.');
	expect(await pickedChannel()).toBe('Torquehaven Garage');
	expect(await page.content()).toContain(episode.title);
});

test('a link followed inside the app switches too, and the top bar follows', async () => {
	const { page } = browser;
	await switchChannel(page, 'Dune Wagon Weekly');
	expect(await pickedChannel()).toBe('Dune Wagon Weekly');
	// A link as a page would render it; the client router follows it without a full load.
	await page.evaluate((href) => {
		const link = document.createElement('a');
		link.href = href;
		link.textContent = 'Open the linked episode';
		document.querySelector('main')!.prepend(link);
	}, `/episodes/${episode.id}`);
	await page.getByRole('link', { name: 'Open the linked episode' }).click();
	await page.waitForURL((url) => url.searchParams.has('switched'));
	await expect
		.poll(() => page.getByRole('status').first().textContent())
		.toContain('Switched to Torquehaven Garage to open this episode.');
	await expect.poll(pickedChannel).toBe('Torquehaven Garage');
	await expect.poll(() => page.content()).toContain(episode.title);
});
