/**
 * In a real browser: the producer invites a camera operator, the invite arrives in the fake mailbox,
 * the invitee sets a password through the link, signs in and sees the camera operator's bench.
 */
import { afterAll, beforeAll, expect, test } from 'vitest';
import { openBrowser, signInAs, type BrowserSession } from '../helpers/browser';
import { demo, linkIn, mailTo } from '../helpers/http';

let browser: BrowserSession;
beforeAll(async () => {
	browser = await openBrowser();
});
afterAll(async () => browser?.close());

test('producer invites a camera operator who sets a password and lands on the camera bench', async () => {
	const { page, context } = browser;
	await signInAs(page, demo.producer);
	await page.getByRole('link', { name: 'Crew' }).click();
	await page.waitForURL('**/crew');
	const invite = page.getByRole('region', { name: 'Invite to the crew' });
	await invite.getByLabel('Name').fill('Tomas Reyne');
	await invite.getByLabel('E-mail').fill('tomas.browser@example.test');
	await invite.getByLabel('Camera operator').check();
	const sentAt = Date.now() - 1000;
	await invite.getByRole('button', { name: 'Send invite' }).click();
	await expect
		.poll(() => page.getByRole('status').textContent())
		.toContain('Invite sent to tomas.browser@example.test');
	await expect
		.poll(() => page.getByRole('row', { name: /Tomas Reyne/ }).textContent())
		.toContain('Invite sent');

	await page.getByRole('button', { name: 'Sign out' }).click();
	await page.waitForURL('**/signin');

	// The fake mailbox page is what a person would open on the demo.
	const mail = await mailTo('tomas.browser@example.test', { after: sentAt });
	await page.goto('/dev/mail');
	await page
		.getByRole('button', { name: /invited to the Torquehaven Garage crew/ })
		.first()
		.click();
	const link = linkIn(mail.text);
	await expect.poll(() => page.getByRole('link', { name: link }).count()).toBe(1);
	await page.getByRole('link', { name: link }).click();

	await page.waitForURL('**/welcome/**');
	expect(await page.getByRole('heading', { level: 1 }).textContent()).toContain(
		'Welcome to the Torquehaven Garage crew'
	);
	await page.getByLabel('New password').fill('the camera rolls at seven');
	await page.getByLabel('Type it again').fill('the camera rolls at seven');
	await page.getByRole('button', { name: 'Set password' }).click();
	await page.waitForURL('**/signin?welcome=1');
	expect(await page.getByRole('status').textContent()).toContain('Password set');

	await signInAs(page, 'tomas.browser@example.test', 'the camera rolls at seven');
	await expect.poll(() => page.getByRole('heading', { name: 'Camera operator' }).count()).toBe(1);
	expect(await page.getByRole('heading', { level: 1 }).textContent()).toMatch(/Tomas/);
	// The camera operator is not shown the producer's crew link, and the server refuses the page anyway.
	expect(
		await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Crew' }).count()
	).toBe(0);
	const response = await page.goto('/crew');
	expect(response?.status()).toBe(403);
	await context.clearCookies();
});
