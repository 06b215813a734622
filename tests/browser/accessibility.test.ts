/**
 * Every main page, signed in as each role on the demo data, checked with axe-core (the npm package
 * `axe-core`, which tests pages against WCAG 2.0, 2.1 and 2.2 levels A and AA: contrast, names and
 * labels, landmarks, ARIA use). No page may have a violation axe rates serious or critical
 * (tests/REFERENCES.md, "Accessibility").
 */
import { afterAll, beforeAll, expect, test } from 'vitest';
import {
	openBrowser,
	seriousFindings,
	signInAs,
	type BrowserSession,
	type Finding
} from '../helpers/browser';
import { demo, sql } from '../helpers/http';

let session: BrowserSession | undefined;
let episodeId: string;
let shootDayId: string;

beforeAll(async () => {
	// The demo episode with the most on it: rundown, script, takes, footage, chapters, notes, parts.
	[{ id: episodeId }] = await sql(
		`SELECT id FROM episode WHERE title = '3-inch rear block lift on Project Mule'`
	);
	[{ id: shootDayId }] = await sql(`SELECT id FROM shoot_day WHERE episode_id = $1 LIMIT 1`, [
		episodeId
	]);
});
afterAll(async () => session?.close());

const episodeTabs = [
	'',
	'/rundown',
	'/script',
	'/shots',
	'/footage',
	'/notes',
	'/edit',
	'/spec-cards',
	'/parts',
	'/publish'
];

const roles = [
	['producer', demo.producer],
	['host', demo.host],
	['camera operator', demo.camera],
	['editor', demo.editor],
	['merch team', demo.merch]
] as const;

test.each(roles)(
	'every main page as the %s has no serious or critical WCAG 2.2 finding (axe-core)',
	async (_role, email) => {
		await session?.close();
		session = await openBrowser({ width: 1280, height: 800 });
		const page = session.page;
		await signInAs(page, email);
		const paths = [
			'/',
			'/episodes',
			...episodeTabs.map((tab) => `/episodes/${episodeId}${tab}`),
			'/shoots',
			`/shoots/${shootDayId}`,
			'/builds',
			'/parts',
			'/follow-ups',
			'/crew',
			'/channel',
			'/account'
		];
		const found: Record<string, Finding[]> = {};
		let checked = 0;
		for (const path of paths) {
			const response = await page.goto(path);
			// Crew and channel settings are the producer's; others get the page's 403 and skip it.
			if (!response || response.status() === 403) continue;
			expect(response.status(), path).toBe(200);
			checked++;
			const findings = await seriousFindings(page);
			if (findings.length) found[path] = findings;
		}
		expect(checked).toBeGreaterThanOrEqual(paths.length - 2);
		expect(found).toEqual({});
	},
	180_000
);
