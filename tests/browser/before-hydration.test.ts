/**
 * In a real browser on a slow link: whatever a person types into a form before the page's scripts
 * arrive is still there once the page has hydrated, and is what gets saved. (Hydration re-applies
 * server-rendered `value` attributes, which used to wipe an e-mail typed or autofilled on the
 * sign-in page.) The scripts are held back with Playwright's request routing, the way a weak
 * shop-bay signal would hold them.
 */
import { afterEach, expect, inject, test } from 'vitest';
import { openBrowser, signInAs, type BrowserSession } from '../helpers/browser';
import { DEMO_PASSWORD, demo, signedIn, sql } from '../helpers/http';

let browser: BrowserSession | undefined;
afterEach(async () => {
	await browser?.close();
	browser = undefined;
});

/** Opens a form page while its scripts are held back, fills it, and waits for hydration. */
async function typeBeforeHydration(
	path: string,
	fill: Record<string, string>,
	signInFirst?: string
) {
	browser = await openBrowser();
	const { page } = browser;
	if (signInFirst) await signInAs(page, signInFirst);
	let release!: () => void;
	const held = new Promise<void>((resolve) => (release = resolve));
	await page.route(/\/_app\/immutable\/.*\.js$/, async (route) => {
		await held;
		await route.continue();
	});
	// `commit` returns as soon as the HTML starts arriving, before any script can run.
	await page.goto(path, { waitUntil: 'commit' });
	for (const [label, value] of Object.entries(fill))
		await page.getByLabel(label, { exact: true }).fill(value);
	expect(await page.evaluate(() => document.documentElement.hasAttribute('data-hydrated'))).toBe(
		false
	);
	release();
	await page.waitForSelector('html[data-hydrated]', { state: 'attached' });
	return page;
}

test('an e-mail and password typed before the page hydrates are kept, and the sign-in goes through', async () => {
	const page = await typeBeforeHydration('/signin', {
		'E-mail': demo.producer,
		Password: DEMO_PASSWORD
	});
	expect(await page.getByLabel('E-mail').inputValue()).toBe(demo.producer);
	expect(await page.getByLabel('Password').inputValue()).toBe(DEMO_PASSWORD);
	await page.getByRole('button', { name: 'Sign in' }).click();
	await page.waitForURL((url) => !url.pathname.startsWith('/signin'));
	expect(new URL(page.url()).pathname).toBe('/');
});

test('an e-mail typed into the reset form before the page hydrates is kept', async () => {
	const page = await typeBeforeHydration('/reset', { 'E-mail': demo.host });
	expect(await page.getByLabel('E-mail').inputValue()).toBe(demo.host);
});

test('a title retyped on a freshly loaded episode page before it hydrates is kept and saved', async () => {
	const producer = await signedIn(demo.producer);
	const title = `Hydration check ${Date.now()}`;
	const created = await producer.action('/episodes/new?/create', {
		title,
		targetRuntime: '8:00',
		frameRate: '25'
	});
	expect(created.location).toMatch(/^\/episodes\//);
	// A new episode opens on its rundown; the details form is on the overview, /episodes/<id>.
	const episodePath = created.location!.split('?')[0].split('/').slice(0, 3).join('/');
	const page = await typeBeforeHydration(
		episodePath,
		{ Title: `${title} retitled` },
		demo.producer
	);
	expect(await page.getByLabel('Title', { exact: true }).inputValue()).toBe(`${title} retitled`);
	await page.getByRole('button', { name: 'Save details' }).click();
	await expect.poll(() => page.getByRole('status').filter({ hasText: 'Saved.' }).count()).toBe(1);
	const [row] = await sql(`SELECT title FROM episode WHERE title LIKE $1`, [`${title}%`]);
	expect(row.title).toBe(`${title} retitled`);
});

test('after a refused sign-in the page still shows the e-mail that was typed', async () => {
	browser = await openBrowser();
	const { page } = browser;
	await page.goto('/signin');
	await page.getByLabel('E-mail').fill(demo.host);
	await page.getByLabel('Password').fill('not the password at all');
	await page.getByRole('button', { name: 'Sign in' }).click();
	await expect.poll(() => page.getByRole('alert').textContent()).toContain("don't match");
	expect(await page.getByLabel('E-mail').inputValue()).toBe(demo.host);
	expect(await page.getByLabel('Password').inputValue()).toBe('not the password at all');
});

test('without scripts, the refused sign-in page is rendered with the typed e-mail filled in', async () => {
	const base = inject('baseUrl');
	const response = await fetch(`${base}/signin`, {
		method: 'POST',
		headers: {
			origin: base,
			accept: 'text/html',
			'content-type': 'application/x-www-form-urlencoded'
		},
		body: new URLSearchParams({ email: demo.host, password: 'not the password at all' })
	});
	expect(response.status).toBe(400);
	const field = (await response.text()).match(/<input[^>]*id="email"[^>]*>/)?.[0] ?? '';
	expect(field).toContain(`value="${demo.host}"`);
});
