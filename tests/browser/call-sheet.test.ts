/**
 * The call sheet of a normal shoot day prints on one page, A4 (ISO 216, 210 × 297 mm) and US
 * Letter (8.5 × 11 in), through Chromium's own print engine, without the app's navigation.
 */
import { afterAll, beforeAll, expect, test } from 'vitest';
import { openBrowser, signInAs, type BrowserSession } from '../helpers/browser';
import { demo, sql } from '../helpers/http';

let browser: BrowserSession;
beforeAll(async () => {
	browser = await openBrowser();
});
afterAll(async () => browser?.close());

/** Pages in a PDF: each page object is "/Type /Page" (ISO 32000-1 §7.7.3.3); "/Pages" is the tree. */
const pageCount = (pdf: Buffer) =>
	(pdf.toString('latin1').match(/\/Type\s*\/Page(?!s)/g) ?? []).length;

test('the demo shoot day’s call sheet fits one A4 and one Letter page and shows its cautions', async () => {
	const { page } = browser;
	const [day] = await sql(
		`SELECT sd.id FROM shoot_day sd JOIN episode e ON e.id = sd.episode_id WHERE e.slug = 'mule-rear-block-lift' LIMIT 1`
	);
	await signInAs(page, demo.camera);
	await page.goto(`/shoots/${day.id}/call-sheet`);
	await expect.poll(() => page.getByText('Cautions for today’s work').count()).toBe(1);
	await page.emulateMedia({ media: 'print' });
	expect(await page.getByRole('navigation', { name: 'Main' }).isVisible()).toBe(false);
	for (const format of ['A4', 'Letter'] as const) {
		const pdf = await page.pdf({ format, printBackground: true });
		expect(pageCount(pdf), `${format} pages`).toBe(1);
	}
});
