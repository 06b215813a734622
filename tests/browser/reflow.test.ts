/**
 * On a phone in the shop bay: every main page of every role fits a 320 CSS px wide screen without
 * sideways scrolling of the whole page. Wide tables and the tab rows scroll inside their own box.
 * Source: W3C WCAG 2.1 Success Criterion 1.4.10 Reflow (content at a width of 320 CSS pixels needs
 * no scrolling in two dimensions; parts such as data tables may scroll on their own).
 */
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { openBrowser, signInAs, type BrowserSession } from '../helpers/browser';
import { demo, sql } from '../helpers/http';

const PHONE = { width: 320, height: 720 };
let ids: { edit: string; published: string; shootDay: string };

beforeAll(async () => {
	const [edit] = await sql(`SELECT id FROM episode WHERE slug = 'mule-285-tyres'`);
	const [published] = await sql(`SELECT id FROM episode WHERE slug = 'tallboy-coil-spacers'`);
	const [shootDay] = await sql(
		`SELECT d.id FROM shoot_day d JOIN channel c ON c.id = d.channel_id WHERE c.name = 'Torquehaven Garage' LIMIT 1`
	);
	ids = { edit: edit.id, published: published.id, shootDay: shootDay.id };
});

const pagesByRole: { who: keyof typeof demo; pages: () => string[] }[] = [
	{
		who: 'producer',
		pages: () => [
			'/',
			'/episodes',
			`/episodes/${ids.published}`,
			'/crew',
			'/channel',
			'/builds',
			'/follow-ups'
		]
	},
	{ who: 'host', pages: () => [`/episodes/${ids.edit}/rundown`, `/episodes/${ids.edit}/script`] },
	{
		who: 'camera',
		pages: () => [
			'/shoots',
			`/shoots/${ids.shootDay}`,
			`/episodes/${ids.edit}/shots`,
			`/episodes/${ids.edit}/footage`
		]
	},
	{
		who: 'producer',
		pages: () => [`/episodes/${ids.published}/edit`, `/episodes/${ids.published}/spec-cards`]
	},
	{
		who: 'merch',
		pages: () => [
			'/parts',
			'/parts/import',
			`/episodes/${ids.published}/notes`,
			`/episodes/${ids.published}/parts`,
			`/episodes/${ids.published}/publish`
		]
	}
];

describe('every page fits a 320 px wide phone (WCAG 2.1 SC 1.4.10 Reflow)', () => {
	const sessions: BrowserSession[] = [];
	afterAll(async () => {
		for (const session of sessions) await session.close();
	});

	for (const { who, pages } of pagesByRole) {
		test(`the ${who}'s pages`, async () => {
			const session = await openBrowser(PHONE);
			sessions.push(session);
			await signInAs(session.page, demo[who]);
			const tooWide: string[] = [];
			for (const path of pages()) {
				const response = await session.page.goto(path);
				expect(response?.status(), path).toBe(200);
				const width = await session.page.evaluate(() => document.documentElement.scrollWidth);
				if (width > PHONE.width) tooWide.push(`${path}: ${width} px`);
			}
			expect(tooWide).toEqual([]);
		});
	}
});
