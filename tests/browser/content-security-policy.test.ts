/**
 * The Content-Security-Policy the server sends does not get in the way of the product: every main
 * page of every role loads, hydrates and runs its scripts in Chromium with no CSP violation, while
 * an inline script the page did not ship is refused. Violations are caught both as
 * `securitypolicyviolation` events (W3C Content Security Policy Level 3, §5.2 "Report a
 * violation") and as the console errors Chromium writes for them.
 */
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { openBrowser, signInAs, switchChannel, type BrowserSession } from '../helpers/browser';
import { demo, sql } from '../helpers/http';

let ids: {
	lift: string;
	edit: string;
	published: string;
	shootDay: string;
	build: string;
	part: string;
};

beforeAll(async () => {
	const episode = async (slug: string) =>
		(await sql(`SELECT id FROM episode WHERE slug = $1`, [slug]))[0].id as string;
	const torquehaven = `(SELECT id FROM channel WHERE name = 'Torquehaven Garage')`;
	ids = {
		lift: await episode('mule-rear-block-lift'),
		edit: await episode('mule-285-tyres'),
		published: await episode('tallboy-coil-spacers'),
		shootDay: (await sql(`SELECT id FROM shoot_day WHERE channel_id = ${torquehaven} LIMIT 1`))[0]
			.id,
		build: (await sql(`SELECT id FROM build WHERE channel_id = ${torquehaven} LIMIT 1`))[0].id,
		part: (await sql(`SELECT id FROM part WHERE channel_id = ${torquehaven} LIMIT 1`))[0].id
	};
});

const everyoneSees = () => [
	'/',
	'/episodes',
	'/shoots',
	'/builds',
	`/builds/${ids.build}`,
	'/parts',
	`/parts/${ids.part}`,
	'/follow-ups',
	'/account',
	`/episodes/${ids.lift}`
];

const pagesByRole: { who: keyof typeof demo; pages: () => string[] }[] = [
	{
		who: 'producer',
		pages: () => [
			...everyoneSees(),
			'/crew',
			'/channel',
			'/episodes/new',
			`/episodes/${ids.published}`,
			`/episodes/${ids.published}/publish`
		]
	},
	{
		who: 'host',
		pages: () => [
			...everyoneSees(),
			`/episodes/${ids.lift}/rundown`,
			`/episodes/${ids.lift}/script`,
			`/episodes/${ids.edit}/script`
		]
	},
	{
		who: 'camera',
		pages: () => [
			...everyoneSees(),
			`/shoots/${ids.shootDay}`,
			`/shoots/${ids.shootDay}/call-sheet`,
			'/shoots/profiles',
			`/episodes/${ids.lift}/shots`,
			`/episodes/${ids.edit}/footage`
		]
	},
	{
		who: 'editor',
		pages: () => [
			...everyoneSees(),
			`/episodes/${ids.published}/edit`,
			`/episodes/${ids.edit}/edit`,
			`/episodes/${ids.published}/spec-cards`
		]
	},
	{
		who: 'merch',
		pages: () => [
			...everyoneSees(),
			'/parts/new',
			'/parts/import',
			`/episodes/${ids.published}/notes`,
			`/episodes/${ids.published}/parts`,
			`/episodes/${ids.published}/publish`
		]
	}
];

/**
 * Collects every CSP violation the page reports, from the first byte of every document on. The
 * answer is everything seen so far; call it before leaving a page, as each document keeps its own.
 */
async function watchViolations(page: Page): Promise<() => Promise<string[]>> {
	const found: string[] = [];
	page.on('console', (message) => {
		if (message.type() === 'error' && /Content Security Policy/i.test(message.text()))
			found.push(`${page.url()}: ${message.text()}`);
	});
	await page.addInitScript(() => {
		const seen: string[] = [];
		(window as unknown as { __cspViolations: string[] }).__cspViolations = seen;
		document.addEventListener('securitypolicyviolation', (event) =>
			seen.push(
				`${location.pathname}: ${event.effectiveDirective} blocked ${event.blockedURI || 'inline'} (${event.sample})`
			)
		);
	});
	return async () => {
		found.push(
			...(await page.evaluate(() =>
				(window as unknown as { __cspViolations: string[] }).__cspViolations.splice(0)
			))
		);
		return [...found];
	};
}

describe('no CSP violations on the main pages of each role', () => {
	const sessions: BrowserSession[] = [];
	afterAll(async () => {
		for (const session of sessions) await session.close();
	});

	test('the policy is enforced: an inline script the page did not ship is refused and reported', async () => {
		const session = await openBrowser();
		sessions.push(session);
		const violations = await watchViolations(session.page);
		await session.page.goto('/signin');
		const ran = await session.page.evaluate(async () => {
			const script = document.createElement('script');
			script.textContent = 'window.__injectedRan = true';
			document.head.append(script);
			await new Promise((resolve) => setTimeout(resolve, 50));
			return (window as unknown as { __injectedRan?: boolean }).__injectedRan === true;
		});
		expect(ran).toBe(false);
		await expect
			.poll(violations)
			.toEqual(expect.arrayContaining([expect.stringContaining('script-src')]));
	});

	test('the sign-in page and the not-found page, signed out', async () => {
		const session = await openBrowser();
		sessions.push(session);
		const violations = await watchViolations(session.page);
		expect((await session.page.goto('/signin'))?.status()).toBe(200);
		expect(await violations()).toEqual([]);
		await signInAs(session.page, demo.producer);
		expect((await session.page.goto('/no-such-bench'))?.status()).toBe(404);
		expect(await violations()).toEqual([]);
	});

	for (const { who, pages } of pagesByRole) {
		test(`the ${who}'s pages`, async () => {
			const session = await openBrowser();
			sessions.push(session);
			const violations = await watchViolations(session.page);
			await signInAs(session.page, demo[who]);
			if (who === 'editor') {
				// The shared editor may start in the other channel: switch like a person would.
				await switchChannel(session.page, 'Torquehaven Garage');
			}
			for (const path of pages()) {
				// goto waits for <html data-hydrated>: the page's own scripts ran under the policy.
				const response = await session.page.goto(path);
				expect(response?.status(), path).toBe(200);
				await violations();
			}
			expect(await violations()).toEqual([]);
		});
	}
});
