/**
 * In a real browser: a published episode's rundown, segment, script and notes pages say why they
 * can't be changed (the reason and the stage to move back to) and offer no editing controls, even
 * to a producer, who holds every role; the same pages of an episode in the edit stage offer them.
 * The rule is our own (tests/REFERENCES.md, "Production stages": common practice, from memory).
 */
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { openBrowser, signInAs, type BrowserSession } from '../helpers/browser';
import { demo, sql } from '../helpers/http';

let browser: BrowserSession;
const ids = { published: '', publishedSegment: '', edit: '', editSegment: '' };

/** The page's own editing controls: buttons of forms posting to a named action (not the top bar's channel picker) and writable text boxes. */
async function editingControls() {
	const { page } = browser;
	const forms = await page
		.locator('main form[action*="?/"]:not([action^="/channel"]) button:enabled')
		.evaluateAll((nodes) => nodes.map((node) => node.closest('form')!.getAttribute('action')));
	const textBoxes = await page.locator('main textarea:enabled:not([readonly])').count();
	return { forms, textBoxes };
}

beforeAll(async () => {
	const first = async (slug: string) =>
		(
			await sql(
				`SELECT e.id, s.id AS segment FROM episode e JOIN segment s ON s.episode_id = e.id
				 WHERE e.slug = $1 ORDER BY s.position LIMIT 1`,
				[slug]
			)
		)[0];
	const published = await first('tallboy-coil-spacers');
	const edit = await first('mule-rear-block-lift');
	Object.assign(ids, {
		published: published.id,
		publishedSegment: published.segment,
		edit: edit.id,
		editSegment: edit.segment
	});
	browser = await openBrowser();
	await signInAs(browser.page, demo.producer);
}, 60_000);

afterAll(async () => {
	await browser?.close();
});

const pages = (episode: string, segment: string) => [
	`/episodes/${episode}/rundown`,
	`/episodes/${episode}/rundown/${segment}`,
	`/episodes/${episode}/script`,
	`/episodes/${episode}/script/${segment}`,
	`/episodes/${episode}/notes`
];

describe('a published episode in the browser', () => {
	test('each page shows the lock reason and no enabled editing controls', async () => {
		for (const path of pages(ids.published, ids.publishedSegment)) {
			await browser.page.goto(path);
			const notice = browser.page.locator('[data-stage-lock]');
			await expect.poll(() => notice.count(), { message: path }).toBe(1);
			const reason = await notice.innerText();
			expect(reason, path).toMatch(/^This episode is published: /);
			expect(reason, path).toMatch(/A producer can move it back to (Edit|Locked) to change it\./);
			expect(await editingControls(), path).toEqual({ forms: [], textBoxes: 0 });
		}
	});

	test('the same pages of an episode in the edit stage keep their controls and show no lock', async () => {
		for (const path of pages(ids.edit, ids.editSegment)) {
			await browser.page.goto(path);
			expect(await browser.page.locator('[data-stage-lock]').count(), path).toBe(0);
			const { forms, textBoxes } = await editingControls();
			expect(forms.length + textBoxes, path).toBeGreaterThan(0);
		}
	});
});
