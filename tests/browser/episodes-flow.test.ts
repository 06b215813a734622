/**
 * In real browsers, as new users would work: a producer starts an episode, the host plans the
 * rundown, writes and sends the script, the producer approves it, the camera operator plans the
 * shots, and the host moves it to the shoot; and two people editing one script lose nothing.
 * Conflict handling follows RFC 9110 §15.5.10 (409 Conflict: the request conflicts with the current
 * state); the page shows both versions so the person merges.
 */
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { openBrowser, signInAs, type BrowserSession } from '../helpers/browser';
import { demo, mailTo, signedIn, sql } from '../helpers/http';

const sessions: BrowserSession[] = [];
async function browserFor(email: string): Promise<BrowserSession> {
	const session = await openBrowser();
	session.page.on('dialog', (dialog) => void dialog.accept());
	sessions.push(session);
	await signInAs(session.page, email);
	return session;
}
afterAll(async () => {
	for (const session of sessions) await session.close();
});

describe('from an idea to the shoot', () => {
	let producer: BrowserSession;
	let host: BrowserSession;
	let camera: BrowserSession;
	beforeAll(async () => {
		[producer, host, camera] = await Promise.all([
			browserFor(demo.producer),
			browserFor(demo.host),
			browserFor(demo.camera)
		]);
	});

	test('producer, host and camera operator take a new episode through the script gate', async () => {
		const title = `Winch bumper on Project Tallboy ${Date.now()}`;
		// The producer starts it.
		let page = producer.page;
		await page.goto('/episodes');
		await page.getByRole('link', { name: 'New episode' }).click();
		await page.getByLabel('Title', { exact: true }).fill(title);
		await page.getByLabel(/Target runtime/).fill('9:00');
		await page.getByLabel('Planned publish date').fill('2027-04-16');
		await page.getByLabel(/Project Tallboy/).check();
		await page.getByLabel('Host', { exact: true }).selectOption({ label: 'Rico Valdane' });
		await page
			.getByLabel('Camera operator', { exact: true })
			.selectOption({ label: 'Mika Strand' });
		await page.getByLabel('Editor', { exact: true }).selectOption({ label: 'Jules Farrow' });
		await page.getByRole('button', { name: 'Create episode' }).click();
		await page.waitForURL(/\/rundown\?created=1/);
		const episodeId = /episodes\/([0-9a-f-]{36})/.exec(page.url())![1];
		expect(await page.getByRole('status').first().textContent()).toContain(
			'Episode created at the script stage'
		);

		// The host finds it on the bench and plans the rundown.
		page = host.page;
		await page.goto('/');
		await page.getByRole('link', { name: `Rundown to plan: ${title}` }).click();
		await page.waitForURL(`**/episodes/${episodeId}/rundown`);
		const add = async (
			kind: string,
			segmentTitle: string,
			planned: string,
			hazards: string[] = []
		) => {
			await page.getByLabel('Kind').selectOption({ label: kind });
			await page.getByLabel('Title', { exact: true }).fill(segmentTitle);
			await page.getByLabel('Planned duration').fill(planned);
			for (const hazard of hazards)
				await page.locator('label').filter({ hasText: hazard }).first().click();
			await page.getByRole('button', { name: 'Add segment' }).click();
			await expect
				.poll(() => page.getByRole('status').first().textContent())
				.toContain(`Added “${segmentTitle}”`);
		};
		await add('Cold open', 'Why a winch bumper', '0:30');
		await add('Install step', 'Bolting the bumper on', '2:30', [
			'Vehicle raised on stands',
			'Cutting or grinding'
		]);
		await add('Call to action', 'Parts and the shop', '0:20');
		const rundown = page.getByTestId('rundown');
		await expect
			.poll(() => rundown.locator('li a.font-bold').allTextContents())
			.toEqual(['Why a winch bumper', 'Bolting the bumper on', 'Parts and the shop']);
		expect(await rundown.textContent()).toContain('⚠ Cutting or grinding · not placed');

		// The host writes two segments.
		await page.getByRole('link', { name: 'Write' }).first().click();
		await page
			.locator('#script-body')
			.fill(
				'The stock bumper on **Tallboy** bends if you look at it. Today it comes off for a steel one with a winch plate.'
			);
		await page.getByRole('button', { name: 'Save script' }).click();
		await expect.poll(() => page.getByTestId('save-status').textContent()).toMatch(/Saved/);
		await page.getByRole('link', { name: 'Segment 2 →' }).click();
		// Segment 1's script URL matches the same pattern, so wait for segment 2's own heading:
		// typing earlier lands in segment 1's editor, which the navigation then replaces.
		await page.getByRole('heading', { level: 1, name: 'Bolting the bumper on' }).waitFor();
		await page
			.locator('#script-body')
			.fill(
				'Frame on stands, never the jack alone. Four bolts a side, then the old brackets get cut off. [[B-roll: sparks]]'
			);
		await page.getByRole('button', { name: 'Save script' }).click();
		await expect.poll(() => page.getByTestId('save-status').textContent()).toMatch(/Saved/);

		// The host rewords a caution card and sends the script for approval.
		await page.goto(`/episodes/${episodeId}/rundown`);
		await page.getByRole('link', { name: 'Bolting the bumper on' }).click();
		const cutting = page.getByRole('article', { name: 'Caution: Cutting or grinding' });
		await cutting
			.getByLabel(/Words on screen/)
			.fill('Eye, ear and hand protection on. Sparks away from the fuel tank and lines.');
		await cutting.getByRole('button', { name: 'Save caution' }).click();
		await expect
			.poll(() => cutting.textContent())
			.toContain('Sparks away from the fuel tank and lines.');
		await page.goto(`/episodes/${episodeId}/script`);
		await page.getByRole('button', { name: 'Send for approval' }).click();
		await expect
			.poll(() => page.getByRole('status').first().textContent())
			.toContain('Sent to the producer for approval');

		// The gate still refuses, and says whose turn it is.
		await page.goto(`/episodes/${episodeId}`);
		const reasons = await page.getByTestId('gate-reasons').textContent();
		expect(reasons).toContain('The script is waiting for a producer to approve it');
		expect(reasons).toContain('Segment 1 “Why a winch bumper”');
		expect(reasons).toContain('Segment 2 “Bolting the bumper on”');
		expect(reasons).not.toContain('Parts and the shop');

		// The producer approves from the bench.
		page = producer.page;
		await page.goto('/');
		await page.getByRole('link', { name: `Script awaiting your approval: ${title}` }).click();
		await page.getByRole('button', { name: 'Approve this script' }).click();
		await expect.poll(() => page.getByRole('status').first().textContent()).toContain('Approved');

		// The camera operator plans a shot for each segment that needs footage.
		page = camera.page;
		await page.goto('/');
		await page.getByRole('link', { name: `Shot list to plan: ${title}` }).click();
		for (const segmentTitle of ['Why a winch bumper', 'Bolting the bumper on']) {
			await page.goto(`/episodes/${episodeId}/rundown`);
			await page.getByRole('link', { name: segmentTitle }).click();
			await page.getByLabel('What the shot shows').fill(`${segmentTitle}: wide`);
			await page.getByLabel('Camera').fill('A-cam');
			await page.getByRole('button', { name: 'Add shot' }).click();
			await expect.poll(() => page.getByRole('status').first().textContent()).toContain('Added');
		}

		// The host moves it to the shoot.
		page = host.page;
		const sentAt = Date.now() - 1000;
		await page.goto(`/episodes/${episodeId}`);
		expect(await page.getByTestId('gate-passes').textContent()).toContain(
			'Every gate check for Shoot passes'
		);
		await page.getByLabel(/Note for the history/).fill('Bay 3, Saturday 8:00');
		await page.getByRole('button', { name: 'Move to Shoot' }).click();
		await page.waitForURL(/moved=shoot/);
		expect(await page.getByTestId('stage-history').textContent()).toMatch(
			/Script → Shoot\s*Rico Valdane/
		);
		const mail = await mailTo(demo.camera, { after: sentAt });
		expect(mail.subject).toBe(`Shoot is yours: ${title}`);
		expect(mail.text).toContain('Bay 3, Saturday 8:00');
		expect((await sql(`SELECT stage FROM episode WHERE id = $1`, [episodeId]))[0].stage).toBe(
			'shoot'
		);
	});
});

describe('two people on one script', () => {
	test('the second save shows both versions, the merge is saved, and nothing is lost', async () => {
		const api = await signedIn(demo.producer);
		const [rico] = await sql(`SELECT id FROM person WHERE email = $1`, [demo.host]);
		const episode = (
			await api.api('/api/episodes', {
				method: 'POST',
				json: {
					title: `Two writers ${Date.now()}`,
					targetRuntimeSeconds: 300,
					frameRate: '25',
					assignments: { host: rico.id }
				}
			})
		).body.episode;
		const segment = (
			await api.api(`/api/episodes/${episode.id}/segments`, {
				method: 'POST',
				json: { kind: 'overview', title: 'Intro', plannedSeconds: 60 }
			})
		).body.segment;
		await api.api(`/api/segments/${segment.id}/script`, {
			method: 'PUT',
			json: { body: 'Line one.', version: segment.script.version }
		});
		const path = `/episodes/${episode.id}/script/${segment.id}`;
		const [hostSession, producerSession] = await Promise.all([
			browserFor(demo.host),
			browserFor(demo.producer)
		]);
		const hostPage = hostSession.page;
		const producerPage = producerSession.page;
		await Promise.all([hostPage.goto(path), producerPage.goto(path)]);

		await hostPage.locator('#script-body').fill('Line one.\n\nHost adds the torque figure.');
		await hostPage.getByRole('button', { name: 'Save script' }).click();
		await expect
			.poll(() => hostPage.getByTestId('save-status').textContent())
			.toMatch(/Saved · version 3/);

		await producerPage.locator('#script-body').fill('Line one, tighter.');
		await producerPage.getByRole('button', { name: 'Save script' }).click();
		const merge = producerPage.getByTestId('merge-panel');
		await expect
			.poll(() => merge.textContent())
			.toContain('Rico Valdane saved this segment while you were writing');
		expect(await producerPage.getByTestId('their-version').textContent()).toContain(
			'＋ Host adds the torque figure.'
		);
		expect(await producerPage.locator('#script-body').inputValue()).toBe('Line one, tighter.');
		expect(
			(await sql(`SELECT body FROM segment_script WHERE segment_id = $1`, [segment.id]))[0].body
		).toBe('Line one.\n\nHost adds the torque figure.');

		await producerPage.getByRole('button', { name: 'Put their text below mine' }).click();
		expect(await producerPage.locator('#script-body').inputValue()).toBe(
			'Line one, tighter.\n\nLine one.\n\nHost adds the torque figure.'
		);
		await producerPage
			.locator('#script-body')
			.fill('Line one, tighter.\n\nHost adds the torque figure.');
		await producerPage.getByRole('button', { name: 'Save script' }).click();
		await expect
			.poll(() => producerPage.getByTestId('save-status').textContent())
			.toMatch(/Saved · version 4/);
		expect(
			(await sql(`SELECT body, version FROM segment_script WHERE segment_id = $1`, [segment.id]))[0]
		).toEqual({ body: 'Line one, tighter.\n\nHost adds the torque figure.', version: 4 });

		// The host, still on the old text, is told on their next save rather than overwriting the merge.
		await hostPage
			.locator('#script-body')
			.fill('Line one.\n\nHost adds the torque figure. And a tip.');
		await hostPage.getByRole('button', { name: 'Save script' }).click();
		await expect
			.poll(() => hostPage.getByTestId('merge-panel').textContent())
			.toContain('Dana Okafor saved this segment');
		expect(
			(await sql(`SELECT version FROM segment_script WHERE segment_id = $1`, [segment.id]))[0]
				.version
		).toBe(4);
	});
});
