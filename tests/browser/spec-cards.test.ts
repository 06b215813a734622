/**
 * In a real browser: the editor opens the demo tyre episode's spec cards, adds a tyre-change card
 * and a torque card with their live previews, and downloads the CSV export.
 *
 * Expected figures come from outside sources, not from the code:
 * - Tyres: handbook arithmetic (tests/REFERENCES.md, "Tyres"): 265/70R17 → 31.61 in (802.8 mm),
 *   285/70R17 → 32.71 in (830.8 mm); axle height rises by half the diameter change (common practice); true speed =
 *   indicated × 32.71 ÷ 31.61.
 * - Torque: NIST SP 811 Appendix B.8, 1 ft·lbf = 1.355818 N·m.
 * - Timecode: SMPTE ST 12-1 drop-frame labels at 29.97, checked with the npm package `smpte-timecode`;
 *   clock time to frames at the exact rate 30000/1001 (tests/REFERENCES.md, "Frame rates").
 * - CSV: RFC 4180, read back with `papaparse`.
 */
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import Papa from 'papaparse';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, expect, test } from 'vitest';
import { openBrowser, signInAs, switchChannel, type BrowserSession } from '../helpers/browser';
import { demo, sql } from '../helpers/http';
import { parseTyreSize } from '$lib/specs';

const require = createRequire(import.meta.url);
const smpte = require('smpte-timecode') as (
	frames: number,
	rate: [number, number],
	dropFrame: boolean
) => { toString(): string };
const dropFrameLabel = (frames: number) => smpte(frames, [30000, 1001], true).toString();

let browser: BrowserSession;
beforeAll(async () => {
	browser = await openBrowser();
});
afterAll(async () => browser?.close());

/** The preview's figure rows as [label, imperial, metric]. */
async function previewLines(page: Page): Promise<string[][]> {
	const preview = page.locator('#card-form [data-testid="spec-card-preview"]');
	await preview.waitFor();
	return preview
		.locator('[data-spec-line]')
		.evaluateAll((rows) =>
			rows.map((row) =>
				[...row.querySelectorAll('[role="rowheader"], [role="cell"]')].map(
					(cell) => cell.textContent?.trim() ?? ''
				)
			)
		);
}

test('the editor adds a tyre-change card and a torque card, sees the right numbers, and downloads the CSV', async () => {
	const { page } = browser;
	const [episode] = await sql(`SELECT id, slug FROM episode WHERE slug = 'mule-285-tyres'`);
	const before = await sql(`SELECT id FROM spec_card WHERE episode_id = $1`, [episode.id]);

	await signInAs(page, demo.editor);
	// The shared editor may start in the other channel: switch like a person would.
	await switchChannel(page, 'Torquehaven Garage');
	await page.goto(`/episodes/${episode.id}/spec-cards`);
	expect(await page.getByRole('heading', { level: 1 }).textContent()).toBe('Spec cards');

	// Tyre change is the kind the form starts with. A half-typed size shows the parser's words beside the field.
	expect(await page.getByRole('radio', { name: 'Tyre change' }).isChecked()).toBe(true);
	await page.getByLabel('Old tyre size').fill('265/70R17');
	await page.getByLabel('New tyre size').fill('285/70');
	const parserWords = (() => {
		try {
			parseTyreSize('285/70');
		} catch (failure) {
			return (failure as Error).message;
		}
		return '';
	})();
	await page.getByText(parserWords, { exact: true }).waitFor();
	const newSize = page.getByLabel('New tyre size');
	expect(await newSize.getAttribute('aria-invalid')).toBe('true');
	// The message is tied to the field for screen readers, not only placed beside it.
	expect(
		await page.locator(`#${await newSize.getAttribute('aria-describedby')}`).textContent()
	).toBe(parserWords);

	await page.getByLabel('New tyre size').fill('285/70R17');
	const tyreLines = await previewLines(page);
	// 31.61 in → 32.71 in, 802.8 mm → 830.8 mm (handbook worked examples), shown to 0.1 in and whole mm.
	expect(tyreLines).toContainEqual(['Overall diameter', '31.6 in → 32.7 in', '803 mm → 831 mm']);
	expect(tyreLines).toContainEqual(['Diameter change', '+1.1 in', '+28 mm']);
	// Half of 1.10 in = 0.55 in (shown to 0.01 in, half of a 0.1 in figure); half of 28 mm = 14 mm (common practice).
	expect(tyreLines).toContainEqual([
		'Axle height change (half the diameter change)',
		'+0.55 in',
		'+14 mm'
	]);
	// 60 × 32.71 ÷ 31.61 = 62.09 mph; 100 × 32.71 ÷ 31.61 = 103.48 km/h.
	expect(tyreLines).toContainEqual([
		'True speed at an indicated 60 mph / 100 km/h',
		'62.1 mph',
		'103.5 km/h'
	]);

	await page
		.getByLabel('Segment')
		.selectOption({ label: '3. The numbers: diameter and clearance' });
	await page.getByLabel('Program time').fill('3:00');
	// The card puts 629 characters on screen: 37 s to read at 17 a second (tests/REFERENCES.md,
	// "Reading speed"), so the 6 s the form starts with would be refused.
	await page.getByLabel('On screen (s)').fill('37');
	// 180 s × 30000/1001 = 5394.6 → frame 5395.
	await page.getByText(`Reads as ${dropFrameLabel(5395)} at 29.97 fps drop-frame.`).waitFor();
	await page.getByRole('button', { name: 'Add card' }).click();
	await page.waitForURL((url) => url.hash.startsWith('#card-'));
	const rows = page.locator('[data-card-row]');
	await expect.poll(() => rows.filter({ hasText: dropFrameLabel(5395) }).count()).toBe(1);

	// Now the torque card for the lug nuts.
	// The kind buttons are labels around visually hidden radios: click the label, as a person does.
	const torqueKind = page.getByRole('radio', { name: 'Torque' });
	await page.locator('label').filter({ has: torqueKind }).click();
	expect(await torqueKind.isChecked()).toBe(true);
	await page.getByLabel('Torque value').fill('95');
	await page.getByLabel('Fastener').fill('Lug nuts');
	// NIST SP 811 B.8: 95 × 1.355818 = 128.80 N·m → 129 N·m.
	expect(await previewLines(page)).toEqual([['Torque', '95 ft·lbf', '129 N·m']]);
	await page
		.locator('#card-form')
		.getByText("Verify against the manufacturer's instructions.")
		.waitFor();
	await page.getByLabel('Segment').selectOption({ label: '5. Mount, balance and torque' });
	await page.getByLabel('Program time').fill('6:10');
	await page.getByRole('button', { name: 'Add card' }).click();
	// 370 s × 30000/1001 = 11088.9 → frame 11089.
	await expect.poll(() => rows.filter({ hasText: dropFrameLabel(11089) }).count()).toBe(1);
	const listed = rows.filter({ hasText: 'Lug nuts' });
	expect(await listed.textContent()).toContain("Verify against the manufacturer's instructions.");

	const saved = await sql(
		`SELECT kind, input, at_frame FROM spec_card WHERE episode_id = $1 AND at_frame IS NOT NULL ORDER BY at_frame`,
		[episode.id]
	);
	expect(saved).toEqual([
		{
			kind: 'tyre-change',
			input: { kind: 'tyre-change', from: '265/70R17', to: '285/70R17' },
			at_frame: 5395
		},
		{
			kind: 'torque',
			input: { kind: 'torque', value: 95, unit: 'ft·lbf', fastener: 'Lug nuts' },
			at_frame: 11089
		}
	]);
	expect((await sql(`SELECT id FROM spec_card WHERE episode_id = $1`, [episode.id])).length).toBe(
		before.length + 2
	);

	const [download] = await Promise.all([
		page.waitForEvent('download'),
		page.getByRole('link', { name: 'Download CSV' }).click()
	]);
	expect(download.suggestedFilename()).toBe(`${episode.slug}-spec-cards.csv`);
	const parsed = Papa.parse<Record<string, string>>(
		readFileSync((await download.path())!, 'utf8'),
		{ header: true, skipEmptyLines: true }
	);
	expect(parsed.errors).toEqual([]);
	const placed = parsed.data.filter((row) => row.start_timecode !== '');
	expect(placed.map((row) => [row.kind, row.start_timecode])).toEqual([
		['tyre-change', dropFrameLabel(5395)],
		['torque', dropFrameLabel(11089)]
	]);
	expect(placed[0]).toMatchObject({
		heading: '265/70R17 → 285/70R17',
		line_1_imperial: '31.6 in → 32.7 in',
		line_1_metric: '803 mm → 831 mm',
		line_3_imperial: '+0.55 in'
	});
	expect(placed[1]).toMatchObject({
		heading: 'Lug nuts',
		line_1_imperial: '95 ft·lbf',
		line_1_metric: '129 N·m',
		cautions: "Verify against the manufacturer's instructions."
	});
});
