/**
 * In a real browser: the spec-card form's preview says how long the card needs on screen against
 * the time typed ("needs 41 s to read; shown 6 s"). Reading time is characters ÷ 17 rounded up
 * (common practice for subtitles, from memory; tests/REFERENCES.md, "Reading speed"): the
 * five-note lift card puts 687 characters on screen, 687 ÷ 17 = 40.4 → 41 s.
 */
import { afterAll, beforeAll, expect, test } from 'vitest';
import { openBrowser, signInAs, switchChannel, type BrowserSession } from '../helpers/browser';
import { demo, sql } from '../helpers/http';

let browser: BrowserSession;
beforeAll(async () => {
	browser = await openBrowser();
});
afterAll(async () => browser?.close());

test('the card preview shows the seconds the card needs to read against the seconds typed', async () => {
	const { page } = browser;
	const [episode] = await sql(`SELECT id FROM episode WHERE slug = 'mule-285-tyres'`);
	await signInAs(page, demo.editor);
	await switchChannel(page, 'Torquehaven Garage');
	await page.goto(`/episodes/${episode.id}/spec-cards`);

	const liftKind = page.getByRole('radio', { name: 'Lift' });
	await page.locator('label').filter({ has: liftKind }).click();
	await page.locator('#card-front-lift').fill('2');
	await page.locator('#card-rear-lift').fill('3');
	await page.locator('#card-form select[name="frontSuspension"]').selectOption('coil');
	await page.locator('#card-form select[name="rearSuspension"]').selectOption('leaf');
	await page.locator('#card-form select[name="method.front"]').selectOption('coil-spacer');
	await page.locator('#card-form select[name="method.rear"]').selectOption('coilovers');

	const reading = page.getByTestId('spec-card-reading');
	// The form starts at the 6 s default: far too short for 687 characters.
	await expect.poll(() => reading.textContent()).toContain('needs 41 s to read; shown 6 s');
	expect(await reading.textContent()).toContain('show it for at least 41 s');
	await page.getByLabel('On screen (s)').fill('41');
	await expect.poll(() => reading.textContent()).toContain('needs 41 s to read; shown 41 s');
	expect(await reading.textContent()).not.toContain('at least');
});
