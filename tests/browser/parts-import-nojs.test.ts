/**
 * In a real browser with JavaScript switched off: the merch team checks a CSV file, sees the rows it
 * would add, imports them with the same page, and a file with a bad row shows the row and imports
 * nothing. The files are written with `papaparse` (RFC 4180, the npm reference writer).
 */
import Papa from 'papaparse';
import { afterAll, beforeAll, expect, test } from 'vitest';
import { openBrowser, signInAs, type BrowserSession } from '../helpers/browser';
import { demo, sql } from '../helpers/http';

let browser: BrowserSession;
const stamp = Date.now();
const skus = [`NOJS-${stamp}-1`, `NOJS-${stamp}-2`];
const header = ['sku', 'name', 'category', 'brand', 'price', 'store_url'];
const file = (rows: string[][]) => ({
	name: 'bracket-order.csv',
	mimeType: 'text/csv',
	buffer: Buffer.from(Papa.unparse([header, ...rows], { newline: '\r\n' }))
});

beforeAll(async () => {
	browser = await openBrowser(undefined, { javaScript: false });
	await signInAs(browser.page, demo.merch);
});

afterAll(async () => {
	await browser?.close();
	await sql(`DELETE FROM part WHERE sku = ANY($1)`, [skus]);
});

test('without JavaScript, a CSV is checked, previewed and imported from the same page', async () => {
	const { page } = browser;
	await page.goto('/parts/import');
	await page.getByLabel('CSV file').setInputFiles(
		file([
			[
				skus[0],
				'Shock relocation bracket, left',
				'Brackets',
				'Kingbolt Suspension',
				'39.00',
				'https://shop.torquehaven.test/p/nojs-1'
			],
			[
				skus[1],
				'Shock relocation bracket, right',
				'Brackets',
				'Kingbolt Suspension',
				'39.00',
				'https://shop.torquehaven.test/p/nojs-2'
			]
		])
	);
	await page.getByRole('button', { name: 'Check the file' }).click();
	await page.waitForURL('**/parts/import?/check');
	const summary = page.getByRole('status');
	expect(await summary.textContent()).toMatch(
		/bracket-order\.csv: 2 rows · 2 new · 0 to update · 0 problems/
	);
	// The columns were guessed from the headers and are listed.
	expect(await page.getByRole('definition').filter({ hasText: 'store_url' }).count()).toBe(1);
	expect(await sql(`SELECT sku FROM part WHERE sku = ANY($1)`, [skus])).toEqual([]);

	await page.getByRole('button', { name: 'Import 2 parts' }).click();
	await page.waitForURL('**/parts/import?/commit');
	expect(await page.getByRole('status').textContent()).toContain(
		'Imported bracket-order.csv: 2 new, 0 updated'
	);
	const stored = await sql(
		`SELECT sku, name, price_cents FROM part WHERE sku = ANY($1) ORDER BY sku`,
		[skus]
	);
	expect(stored).toEqual([
		{ sku: skus[0], name: 'Shock relocation bracket, left', price_cents: 3900 },
		{ sku: skus[1], name: 'Shock relocation bracket, right', price_cents: 3900 }
	]);
});

test('without JavaScript, a file with a bad row names the row and offers no import', async () => {
	const { page } = browser;
	await page.goto('/parts/import');
	await page
		.getByLabel('CSV file')
		.setInputFiles(
			file([
				[
					`NOJS-${stamp}-bad`,
					'Bracket with no price',
					'Brackets',
					'Kingbolt Suspension',
					'free',
					'https://shop.torquehaven.test/p/bad'
				]
			])
		);
	await page.getByRole('button', { name: 'Check the file' }).click();
	await page.waitForURL('**/parts/import?/check');
	expect(await page.getByRole('status').textContent()).toContain('1 problem');
	// Spreadsheet row numbers: the header is row 1, so the only part is row 2.
	expect(await page.getByTestId('import-errors').textContent()).toContain('row 2');
	expect(await page.getByRole('button', { name: /^Import/ }).count()).toBe(0);
});

test('without JavaScript, checking with no file picked says so beside the file field', async () => {
	const { page } = browser;
	await page.goto('/parts/import');
	await page.getByRole('button', { name: 'Check the file' }).click();
	await page.waitForURL('**/parts/import?/check');
	expect(await page.locator('#import-file-error').textContent()).toContain('Pick a CSV file first');
	expect(await page.getByLabel('CSV file').getAttribute('aria-invalid')).toBe('true');
});
