/**
 * Links into another channel: a crew member who works in two channels opens a mailed link to a
 * record of the channel that isn't current, and the app switches to that channel and says so; a
 * person outside the record's channel still gets 404 and no hint where it lives; the API never
 * switches; and the channel last chosen is where the next sign-in starts.
 * - Access control: OWASP ASVS 4.0 V4 (checked on the server, deny by default; records of a
 *   channel one is not on are "not found").
 * - Status codes: RFC 9110 §15.4.4 (303 See Other, followed with GET) and §15.5.5 (404 Not Found).
 */
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { Visitor, demo, signedIn, sql } from '../helpers/http';

const ids = {
	torquehaven: '',
	dunewagon: '',
	episode: '', // Torquehaven
	shootDay: '', // Torquehaven
	part: '', // Torquehaven
	build: '' // Dune Wagon
};

/** Where the editor (on both channels) works right now, as the API reports it. */
const channelOf = async (visitor: Visitor) => (await visitor.api('/api/me')).body.channel.name;

async function switchTo(visitor: Visitor, channelId: string) {
	const answer = await visitor.request('/channel?/switch', {
		method: 'POST',
		form: { channelId, next: '/' }
	});
	expect(answer.status).toBe(303);
}

beforeAll(async () => {
	[{ id: ids.torquehaven }] = await sql(`SELECT id FROM channel WHERE name = 'Torquehaven Garage'`);
	[{ id: ids.dunewagon }] = await sql(`SELECT id FROM channel WHERE name = 'Dune Wagon Weekly'`);
	[{ id: ids.episode }] = await sql(`SELECT id FROM episode WHERE channel_id = $1 LIMIT 1`, [
		ids.torquehaven
	]);
	[{ id: ids.part }] = await sql(`SELECT id FROM part WHERE channel_id = $1 LIMIT 1`, [
		ids.torquehaven
	]);
	[{ id: ids.build }] = await sql(`SELECT id FROM build WHERE channel_id = $1 LIMIT 1`, [
		ids.dunewagon
	]);
	const [day] = await sql(
		`INSERT INTO shoot_day (channel_id, episode_id, shoot_date, location_name, call_time, wrap_time)
		 VALUES ($1, $2, '2026-12-20', 'Bay 2, link test', '08:00', '16:00') RETURNING id`,
		[ids.torquehaven, ids.episode]
	);
	ids.shootDay = day.id;
});

afterAll(async () => {
	await sql(`DELETE FROM shoot_day WHERE id = $1`, [ids.shootDay]);
	// Other test files sign the editor in expecting the first channel by name.
	await sql(`UPDATE person SET last_channel_id = NULL WHERE email = $1`, [demo.editor]);
});

describe('a link to a record of another of one’s channels', () => {
	test('switches to that channel, opens the same address and says it switched', async () => {
		const editor = await signedIn(demo.editor);
		await switchTo(editor, ids.dunewagon);
		const path = `/episodes/${ids.episode}/script`;

		const link = await editor.request(path);
		expect(link.status).toBe(303);
		const location = new URL(link.headers.get('location')!, 'http://x');
		expect(location.pathname).toBe(path);
		expect(location.searchParams.get('switched')).toBe(ids.torquehaven);
		expect(await channelOf(editor)).toBe('Torquehaven Garage');

		const opened = await editor.request(location.pathname + location.search);
		expect(opened.status).toBe(200);
		const html = await opened.text();
		expect(html).toContain('Switched to Torquehaven Garage to open this episode.');
		expect(html).toContain('role="status"');

		// Now in Torquehaven, the same link opens without switching or a notice.
		const again = await editor.request(path);
		expect(again.status).toBe(200);
		expect(await again.text()).not.toContain('Switched to');
	});

	test('works for shoot days, parts and builds, each named in the notice', async () => {
		const editor = await signedIn(demo.editor);
		const cases = [
			{
				path: `/builds/${ids.build}`,
				from: ids.torquehaven,
				to: 'Dune Wagon Weekly',
				what: 'this build'
			},
			{
				path: `/parts/${ids.part}`,
				from: ids.dunewagon,
				to: 'Torquehaven Garage',
				what: 'this part'
			},
			{
				path: `/shoots/${ids.shootDay}`,
				from: ids.dunewagon,
				to: 'Torquehaven Garage',
				what: 'this shoot day'
			}
		];
		for (const { path, from, to, what } of cases) {
			await switchTo(editor, from);
			const link = await editor.request(path);
			expect(link.status, path).toBe(303);
			const opened = await editor.request(link.headers.get('location')!);
			expect(opened.status, path).toBe(200);
			expect(await opened.text()).toContain(`Switched to ${to} to open ${what}.`);
		}
	});

	test('a client-side navigation gets SvelteKit’s redirect answer, with the channel switched', async () => {
		const editor = await signedIn(demo.editor);
		await switchTo(editor, ids.dunewagon);
		const answer = await editor.request(
			`/episodes/${ids.episode}/__data.json?x-sveltekit-invalidated=011`
		);
		expect(answer.status).toBe(200);
		const body = await answer.json();
		expect(body.type).toBe('redirect');
		expect(body.location).toBe(`/episodes/${ids.episode}?switched=${ids.torquehaven}`);
		expect(await channelOf(editor)).toBe('Torquehaven Garage');
	});

	test('a stale or forged flag shows no notice', async () => {
		const editor = await signedIn(demo.editor);
		await switchTo(editor, ids.torquehaven);
		const page = await editor.request(`/episodes/${ids.episode}?switched=${ids.dunewagon}`);
		expect(page.status).toBe(200);
		expect(await page.text()).not.toContain('Switched to');
	});

	test('the API never switches: it answers 404 in the session’s channel', async () => {
		const editor = await signedIn(demo.editor);
		await switchTo(editor, ids.dunewagon);
		expect((await editor.api(`/api/episodes/${ids.episode}`)).status).toBe(404);
		expect(await channelOf(editor)).toBe('Dune Wagon Weekly');
	});
});

describe('a person outside the record’s channel', () => {
	test('gets 404 with no hint which channel the record is in, and their channel stays', async () => {
		const host = await signedIn(demo.host); // Torquehaven only
		const build = await host.request(`/builds/${ids.build}`);
		expect(build.status).toBe(404);
		const notFound = await build.text();
		expect(notFound).not.toContain('Dune Wagon');
		// The error page has no top bar, so it does not send anyone to one.
		expect(notFound).not.toContain('top bar');
		expect(notFound).toContain('opens it in that channel');
		expect(await channelOf(host)).toBe('Torquehaven Garage');

		const sam = await signedIn(demo.otherProducer); // Dune Wagon only
		for (const path of [
			`/episodes/${ids.episode}`,
			`/episodes/${ids.episode}/script`,
			`/parts/${ids.part}`,
			`/shoots/${ids.shootDay}`
		]) {
			const answer = await sam.request(path);
			expect(answer.status, path).toBe(404);
			expect(await answer.text(), path).not.toContain('Torquehaven');
		}
		expect(await channelOf(sam)).toBe('Dune Wagon Weekly');
	});

	test('a crew member whose membership there is disabled gets 404 too', async () => {
		const [editorRow] = await sql(`SELECT id FROM person WHERE email = $1`, [demo.editor]);
		const editor = await signedIn(demo.editor);
		await switchTo(editor, ids.dunewagon);
		await sql(
			`UPDATE membership SET disabled_at = now() WHERE person_id = $1 AND channel_id = $2`,
			[editorRow.id, ids.torquehaven]
		);
		try {
			expect((await editor.request(`/episodes/${ids.episode}`)).status).toBe(404);
			expect(await channelOf(editor)).toBe('Dune Wagon Weekly');
		} finally {
			await sql(
				`UPDATE membership SET disabled_at = NULL WHERE person_id = $1 AND channel_id = $2`,
				[editorRow.id, ids.torquehaven]
			);
		}
	});
});

describe('the channel last chosen', () => {
	test('is where the next sign-in starts, on this browser and on a new one', async () => {
		const editor = await signedIn(demo.editor);
		await switchTo(editor, ids.torquehaven);
		expect((await editor.request('/signout', { method: 'POST', form: {} })).status).toBe(303);
		expect((await editor.signIn(demo.editor)).status).toBe(303);
		expect(await channelOf(editor)).toBe('Torquehaven Garage');

		// A browser that never chose (another device) starts there too.
		expect(await channelOf(await signedIn(demo.editor))).toBe('Torquehaven Garage');

		// Choosing the other channel, by the switcher or by a link, moves it.
		await switchTo(editor, ids.dunewagon);
		expect(await channelOf(await signedIn(demo.editor))).toBe('Dune Wagon Weekly');
		const linked = await signedIn(demo.editor);
		expect((await linked.request(`/parts/${ids.part}`)).status).toBe(303);
		expect(await channelOf(await signedIn(demo.editor))).toBe('Torquehaven Garage');
	});

	test('a remembered channel the person has been taken off is not used', async () => {
		const [editorRow] = await sql(`SELECT id FROM person WHERE email = $1`, [demo.editor]);
		await sql(`UPDATE person SET last_channel_id = $1 WHERE id = $2`, [
			ids.torquehaven,
			editorRow.id
		]);
		await sql(
			`UPDATE membership SET disabled_at = now() WHERE person_id = $1 AND channel_id = $2`,
			[editorRow.id, ids.torquehaven]
		);
		try {
			expect(await channelOf(await signedIn(demo.editor))).toBe('Dune Wagon Weekly');
		} finally {
			await sql(
				`UPDATE membership SET disabled_at = NULL WHERE person_id = $1 AND channel_id = $2`,
				[editorRow.id, ids.torquehaven]
			);
		}
	});
});
