/**
 * In a real browser: the host times their reading of the sample paragraph with the Space bar, sees
 * the pace it makes, and saves it; a mistimed reading is flagged "not a speaking pace" before and
 * after saving. The page's clock is Playwright's fake clock, so the reading takes exactly the time
 * the test says without waiting for it.
 *
 * Sources: the paragraph has 100 spoken words (tests/unit/pace-sample.test.ts); 100 words in 40 s
 * = 150 wpm, the presented-speech default (common practice; Lucas, 125–150 wpm; from memory);
 * 80–260 wpm is our own range of speaking paces (tests/REFERENCES.md, "Narration pace").
 */
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { openBrowser, signInAs, type BrowserSession } from '../helpers/browser';
import { demo, sql } from '../helpers/http';

let browser: BrowserSession;

beforeAll(async () => {
	browser = await openBrowser();
	await sql(`DELETE FROM speaking_pace`);
});
afterAll(async () => {
	await sql(`DELETE FROM speaking_pace`);
	await browser?.close();
});

describe('timing a reading aloud', () => {
	test('Space starts and stops the clock, the pace shows, and saving stores it', async () => {
		const { page } = browser;
		await signInAs(page, demo.host);
		await page.clock.install();
		await page.goto('/pace');
		await expect
			.poll(() => page.getByTestId('pace-sample').textContent())
			.toContain('Before we lift anything');

		// Time stands still from here on, so the reading lasts exactly what runFor says.
		await page.clock.pauseAt(Date.now() + 60_000);
		// Focus on the page body, not a field: Space is the clock's key there.
		await page.locator('h1').click();
		await page.keyboard.press('Space');
		await expect.poll(() => page.getByTestId('pace-timer').textContent()).toContain('Stop');
		await page.clock.runFor(40_000);
		await page.keyboard.press('Space');
		await expect.poll(() => page.locator('#seconds').inputValue()).toBe('40.0');
		// 100 words ÷ (40/60) min = 150 wpm.
		expect(await page.getByTestId('pace-preview').textContent()).toContain('150 words a minute');

		await page.getByRole('button', { name: 'Save this pace' }).click();
		await expect
			.poll(() => page.getByTestId('pace-saved').textContent())
			.toContain('Saved: 150 words a minute');
		const rows = await sql(`SELECT words, milliseconds FROM speaking_pace`);
		expect(rows).toEqual([{ words: 100, milliseconds: 40000 }]);
	});

	test('a reading stopped after 10 s is flagged and refused: 600 wpm is not a speaking pace', async () => {
		const { page } = browser;
		await page.goto('/pace');
		await page.clock.pauseAt(Date.now() + 120_000);
		await page.locator('h1').click();
		await page.keyboard.press('Space');
		await page.clock.runFor(10_000);
		await page.keyboard.press('Space');
		await expect
			.poll(() => page.getByTestId('pace-preview').textContent())
			.toContain('not a speaking pace');
		await page.getByRole('button', { name: 'Save this pace' }).click();
		await expect
			.poll(() => page.locator('#seconds-error').textContent())
			.toContain('600 words a minute: not a speaking pace');
		// The field keeps what was timed; the stored pace is still the 40 s reading.
		expect(await page.locator('#seconds').inputValue()).toBe('10.0');
		expect(await sql(`SELECT milliseconds FROM speaking_pace`)).toEqual([{ milliseconds: 40000 }]);
	});
});
