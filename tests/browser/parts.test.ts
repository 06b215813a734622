/**
 * In a real browser: the merch team imports a CSV file of two new parts, links both to a segment
 * note with the search-as-you-type picker (one by mouse, one by keyboard), and copies the whole
 * publish kit to the clipboard.
 *
 * Outside sources for the checks: the CSV is written with `papaparse` (RFC 4180); the copied text
 * is read back through the browser's own Clipboard API (W3C Clipboard API and events), and the
 * character count is compared with a count of Unicode code points.
 */
import Papa from 'papaparse';
import { afterAll, beforeAll, expect, test } from 'vitest';
import { openBrowser, signInAs, type BrowserSession } from '../helpers/browser';
import { baseUrl, demo, sql } from '../helpers/http';

let browser: BrowserSession;
const stamp = Date.now();
const skus = [`BRWS-${stamp}-1`, `BRWS-${stamp}-2`];
let episodeId: string;
let noteId: string;

beforeAll(async () => {
	const [channel] = await sql(`SELECT id FROM channel WHERE name = 'Torquehaven Garage'`);
	// A 10-minute cut at 29.97 (17982 frames, SMPTE ST 12-1) with three valid chapters and one placed note.
	const [episode] = await sql(
		`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate, stage, cut_duration_frames, logline)
		 VALUES ($1, 'Browser kit test', $2, 600, '29.97', 'edit', 17982, 'A short test install.') RETURNING id`,
		[channel.id, `browser-kit-${stamp}`]
	);
	episodeId = episode.id;
	await sql(
		`INSERT INTO chapter (episode_id, start_frame, title) VALUES ($1, 0, 'Cold open'), ($1, 3000, 'Fitting'), ($1, 9000, 'Road test')`,
		[episodeId]
	);
	const [segment] = await sql(
		`INSERT INTO segment (episode_id, position, kind, title) VALUES ($1, 1, 'install-step', 'Fitting') RETURNING id`,
		[episodeId]
	);
	const [camera] = await sql(`SELECT id FROM person WHERE email = $1`, [demo.camera]);
	// Frame 1799 is 60.03 s at 30000/1001 fps: the description shows 1:00.
	[{ id: noteId }] = await sql(
		`INSERT INTO segment_note (episode_id, segment_id, program_frame, text, author_id) VALUES ($1, $2, 1799, 'Both new brackets on the bench', $3) RETURNING id`,
		[episodeId, segment.id, camera.id]
	);
	browser = await openBrowser();
	await browser.context.grantPermissions(['clipboard-read', 'clipboard-write'], {
		origin: baseUrl()
	});
});

afterAll(async () => {
	await browser?.close();
	await sql(`DELETE FROM episode WHERE id = $1`, [episodeId]);
	await sql(`DELETE FROM part WHERE sku = ANY($1)`, [skus]);
});

test('merch imports a CSV, links two parts to a note, and copies the publish kit', async () => {
	const { page } = browser;
	await signInAs(page, demo.merch);

	// 1. Import two parts from a CSV file.
	await page.goto('/parts/import');
	const csv = Papa.unparse(
		[
			['Part Number', 'Name', 'Category', 'Brand', 'Price', 'Store URL'],
			[
				skus[0],
				'Browser test bracket, left',
				'Brackets',
				'Kingbolt Suspension',
				'12.00',
				`https://shop.torquehaven.test/p/${skus[0].toLowerCase()}`
			],
			[
				skus[1],
				'Browser test bracket, right',
				'Brackets',
				'Kingbolt Suspension',
				'12.50',
				`https://shop.torquehaven.test/p/${skus[1].toLowerCase()}?ref=test`
			]
		],
		{ newline: '\r\n' }
	);
	await page
		.getByLabel('CSV file')
		.setInputFiles({ name: 'brackets.csv', mimeType: 'text/csv', buffer: Buffer.from(csv) });
	await page.getByText('2 rows · 2 new').waitFor();
	expect(await page.getByLabel('SKU (part number) *').inputValue()).toBe('Part Number');
	await page.getByRole('button', { name: 'Import 2 parts' }).click();
	await page.getByText(/Imported brackets\.csv: 2 new, 0 updated/).waitFor();
	expect(
		(await sql(`SELECT sku, price_cents FROM part WHERE sku = ANY($1) ORDER BY sku`, [skus])).map(
			(row) => [row.sku, row.price_cents]
		)
	).toEqual([
		[skus[0], 1200],
		[skus[1], 1250]
	]);

	// 2. Link both to the note: the first with the mouse, the second with the keyboard.
	await page.goto(`/episodes/${episodeId}/notes`);
	const card = page.locator(`[data-note="${noteId}"]`);
	const picker = card.getByRole('combobox', { name: 'Link a part' });
	await picker.fill(`BRWS-${stamp}`);
	await card
		.getByRole('option', { name: new RegExp(`${skus[0]} Browser test bracket, left`) })
		.click();
	await card.getByRole('list', { name: 'Featured parts' }).getByText(skus[0]).waitFor();

	await card.getByRole('combobox', { name: 'Link a part' }).fill(`BRWS-${stamp}`);
	// The part already linked is left out of the list, so the first option is the other one.
	await card.getByRole('option', { name: new RegExp(skus[1]) }).waitFor();
	expect(await card.getByRole('option').count()).toBe(1);
	await page.keyboard.press('Enter');
	await card.getByRole('list', { name: 'Featured parts' }).getByText(skus[1]).waitFor();
	const linked = await sql(
		`SELECT p.sku FROM segment_note_part snp JOIN part p ON p.id = snp.part_id WHERE snp.note_id = $1 ORDER BY p.sku`,
		[noteId]
	);
	expect(linked.map((row) => row.sku)).toEqual(skus);

	// 3. Copy the whole publish kit and read the clipboard back.
	await page.goto(`/episodes/${episodeId}/publish`);
	await page.getByRole('button', { name: 'Copy whole description' }).click();
	await page.getByRole('button', { name: 'Copied' }).waitFor();
	const copied = await page.evaluate(() => navigator.clipboard.readText());
	expect(copied).toBe(await page.getByLabel('Whole description text').inputValue());
	const lines = copied.split('\n');
	expect(lines[0]).toBe('A short test install.');
	expect(lines.slice(2, 6)).toEqual([
		'Chapters',
		'0:00 Cold open',
		'1:40 Fitting',
		'5:00 Road test'
	]);
	const codes = await sql(
		`SELECT p.sku, l.code FROM tracked_link l JOIN part p ON p.id = l.part_id WHERE l.episode_id = $1 ORDER BY p.sku`,
		[episodeId]
	);
	expect(codes).toHaveLength(2);
	for (const [index, side] of ['left', 'right'].entries()) {
		expect(lines).toContain(
			`- Browser test bracket, ${side} (Kingbolt Suspension, ${skus[index]}), at 1:00: ${baseUrl()}/go/${codes[index].code}`
		);
	}
	expect(copied).toMatch(/licensed professional/);
	// Counted as video platforms count a description: UTF-8 bytes (from memory; tests/REFERENCES.md
	// "Publish kit"), here checked against Node's Buffer.byteLength.
	expect(await page.getByTestId('character-count').textContent()).toContain(
		`${Buffer.byteLength(copied, 'utf8').toLocaleString('en')} / 5,000 as platforms count`
	);
	// A "<" typed by hand is flagged with where it is, then the kit is taken back as assembled.
	await page.getByLabel('Whole description text').fill('Lift <2 in\nfits 33s');
	expect(await page.getByTestId('description-problem').textContent()).toContain(
		'“<” on line 1, column 6'
	);
	await page.getByRole('button', { name: 'Start again from the kit' }).click();
	expect(await page.getByLabel('Whole description text').inputValue()).toBe(copied);

	// 4. The safety block can't be left out, and a hand edit that removes it is called out.
	// (The product owner's rule: hazardous work carries its cautions and defers to licensed practice.)
	const safety = page.locator('[data-block="safety"]');
	const box = safety.getByRole('checkbox');
	expect(await box.isChecked()).toBe(true);
	expect(await box.isDisabled()).toBe(true);
	expect(await safety.textContent()).toContain('Always in the description');
	const whole = page.getByLabel('Whole description text');
	const withoutSafety = (await whole.inputValue()).replace(
		/\nSafety\n[\s\S]*?licensed professionals?[^\n]*/,
		''
	);
	await whole.fill(withoutSafety);
	await expect.poll(() => page.getByTestId('required-missing').count()).toBe(1);
	await page.getByRole('button', { name: 'Start again from the blocks' }).click();
	await expect.poll(() => page.getByTestId('required-missing').count()).toBe(0);
	expect(await whole.inputValue()).toMatch(/licensed professional/);

	// 5. The channel's disclosure sits above the links; a hand edit that drops it and keeps the
	// links is called out (a disclosure before the links is common practice; tests/REFERENCES.md,
	// "Publish kit", from memory).
	const [{ disclosure }] = await sql(
		`SELECT disclosure FROM channel WHERE name = 'Torquehaven Garage'`
	);
	const kitText = await whole.inputValue();
	expect(kitText.indexOf(disclosure)).toBeGreaterThan(kitText.indexOf('Parts in this episode'));
	expect(kitText.indexOf(disclosure)).toBeLessThan(kitText.indexOf('/go/'));
	expect(await page.getByTestId('disclosure-note').count()).toBe(1);
	await whole.fill(kitText.replace(`${disclosure}\n`, ''));
	await expect.poll(() => page.getByTestId('disclosure-dropped').count()).toBe(1);
	await page
		.getByTestId('disclosure-dropped')
		.getByRole('button', { name: 'Start again from the blocks' })
		.click();
	await expect.poll(() => page.getByTestId('disclosure-dropped').count()).toBe(0);
	expect(await whole.inputValue()).toContain(disclosure);
});
