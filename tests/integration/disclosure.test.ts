/**
 * The channel's disclosure over HTTP against the built server: the producer sets it (form and API,
 * field messages for bad input, nobody else may), the publish kit places it in the parts block
 * above the tracked links, and the publish gate refuses an episode with tracked links while the
 * channel has none, then lets it through once it is set. The same gate refuses a title over what
 * video platforms take.
 *
 * Outside sources for the checks:
 * - A channel that earns on links discloses it close to them and before them, so it is read before
 *   a click (tests/REFERENCES.md, "Publish kit": common practice, from memory).
 * - Titles of at most 100 characters (tests/REFERENCES.md, "Publish kit": from memory).
 * - Status codes: RFC 9110 §15.5.4 (403 Forbidden), §15.5.21 (422 Unprocessable Content).
 */
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { Visitor, demo, signedIn, sql } from '../helpers/http';

let producer: Visitor;
let merch: Visitor;
let channelId: string;
let original: { disclosure: string };
let tallboy: { id: string; title: string; stage: string };

const DISCLOSURE =
	'Straight talk: the parts links below go to our own shop, and we earn on what you buy through them.';

/** The channel's settings as the form posts them, from what the API says now. */
async function settingsForm(changes: Record<string, string> = {}) {
	const { channel } = (await producer.api('/api/channel')).body;
	return {
		name: channel.name,
		frameRate: channel.frameRate,
		callToAction: channel.callToAction,
		contact: channel.contact,
		descriptionLimit: String(channel.descriptionLimit),
		disclosure: channel.disclosure,
		version: String(channel.version),
		...changes
	};
}

const stageOf = async (id: string) =>
	(await sql(`SELECT stage FROM episode WHERE id = $1`, [id]))[0].stage as string;

async function move(from: string, to: string) {
	return producer.api(`/api/episodes/${tallboy.id}/stage`, {
		method: 'POST',
		json: { from, to }
	});
}

/** Back to picture lock from wherever an earlier test left the episode. */
async function backToLocked() {
	const stage = await stageOf(tallboy.id);
	if (stage !== 'locked') expect((await move(stage, 'locked')).status).toBe(200);
}

async function partsBlock() {
	const kit = (await merch.api(`/api/episodes/${tallboy.id}/publish-kit`)).body;
	return {
		kit,
		block: kit.blocks.find((block: { id: string }) => block.id === 'parts') as {
			text: string;
			problems: string[];
			disclosure: string;
		}
	};
}

beforeAll(async () => {
	producer = await signedIn(demo.producer);
	merch = await signedIn(demo.merch);
	const [channel] = await sql(
		`SELECT id, disclosure FROM channel WHERE name = 'Torquehaven Garage'`
	);
	channelId = channel.id;
	original = { disclosure: channel.disclosure };
	[tallboy] = await sql(
		`SELECT id, title, stage FROM episode WHERE slug = 'tallboy-coil-spacers' AND channel_id = $1`,
		[channelId]
	);
	expect(tallboy.stage).toBe('published');
});

afterAll(async () => {
	// Leave the demo as it was for the other files: the disclosure, the title, published.
	await sql(`UPDATE channel SET disclosure = $2 WHERE id = $1`, [channelId, original.disclosure]);
	await sql(`UPDATE episode SET title = $2, stage = 'published' WHERE id = $1`, [
		tallboy.id,
		tallboy.title
	]);
});

describe('the disclosure setting', () => {
	test('the demo channel has one, and the settings page shows its field', async () => {
		expect(original.disclosure.length).toBeGreaterThan(0);
		const page = await (await producer.request('/channel')).text();
		expect(page).toContain('Disclosure beside the tracked links');
		expect(page).toContain('name="disclosure"');
	});

	test('too long a disclosure gets a message on its field, keeps the typed text and saves nothing', async () => {
		const typed = 'We earn on these links. '.repeat(25); // 600 characters
		const answer = await producer.action(
			'/channel?/save',
			await settingsForm({ disclosure: typed })
		);
		expect(answer.status).toBe(400);
		expect(answer.data.errors.disclosure[0]).toMatch(/under 500 characters/);
		expect(answer.data.values.disclosure).toBe(typed);
		const [row] = await sql(`SELECT disclosure FROM channel WHERE id = $1`, [channelId]);
		expect(row.disclosure).toBe(original.disclosure);
	});

	test('only a producer sets it: the merch team is refused', async () => {
		const { channel } = (await producer.api('/api/channel')).body;
		const answer = await merch.api('/api/channel', {
			method: 'PATCH',
			json: { ...channel, id: undefined, disclosure: 'Merch wrote this.' }
		});
		expect(answer.status).toBe(403);
		const [row] = await sql(`SELECT disclosure FROM channel WHERE id = $1`, [channelId]);
		expect(row.disclosure).toBe(original.disclosure);
	});

	test('the form clears it, and the API saves a new one with the text trimmed', async () => {
		const cleared = await producer.action('/channel?/save', await settingsForm({ disclosure: '' }));
		expect(cleared.type).toBe('success');
		expect((await producer.api('/api/channel')).body.channel.disclosure).toBe('');

		const { channel } = (await producer.api('/api/channel')).body;
		const { id: _id, ...settings } = channel;
		const saved = await producer.api('/api/channel', {
			method: 'PATCH',
			json: { ...settings, disclosure: `  ${DISCLOSURE}\n` }
		});
		expect(saved.status).toBe(200);
		expect(saved.body.channel.disclosure).toBe(DISCLOSURE);
		// An older client that leaves the field out keeps the channel's text.
		const { disclosure: _left, id: _id2, ...without } = saved.body.channel;
		const kept = await producer.api('/api/channel', { method: 'PATCH', json: without });
		expect(kept.status).toBe(200);
		expect(kept.body.channel.disclosure).toBe(DISCLOSURE);
		await sql(`UPDATE channel SET disclosure = '' WHERE id = $1`, [channelId]);
	});
});

describe('the publish kit and the publish gate', () => {
	test('with tracked links and no disclosure the kit says so and publishing is refused; once set, it sits above the links and publishing goes through', async () => {
		expect((await move('published', 'locked')).status).toBe(200);

		// No disclosure: the parts block still lists the links, and says what is missing.
		let { block } = await partsBlock();
		const links = block.text.split('\n').filter((line) => line.includes('/go/'));
		expect(links.length).toBeGreaterThan(0);
		expect(block.text.split('\n')[1]).toMatch(/^- .*\/go\//);
		expect(block.problems.join(' ')).toMatch(/no disclosure.*Channel settings/);

		const refused = await move('locked', 'published');
		expect(refused.status).toBe(422);
		expect(refused.body.gate.reasons).toEqual([
			{
				rule: 'disclosure-missing',
				subject: 'Disclosure',
				message: expect.stringMatching(
					new RegExp(`has ${links.length} tracked links and the channel has no disclosure`)
				),
				fixedBy: 'producer'
			}
		]);
		expect(await stageOf(tallboy.id)).toBe('locked');
		// The episode page's dry run says the same before anyone clicks.
		const report = (await producer.api(`/api/episodes/${tallboy.id}/stage`)).body;
		expect(report.reasons.map((reason: { rule: string }) => reason.rule)).toEqual([
			'disclosure-missing'
		]);

		// The producer writes it: the kit puts it first in the parts block, before every link.
		const saved = await producer.action(
			'/channel?/save',
			await settingsForm({ disclosure: DISCLOSURE })
		);
		expect(saved.type).toBe('success');
		const after = await partsBlock();
		block = after.block;
		const kit = after.kit;
		const lines = block.text.split('\n');
		expect(lines[0]).toBe('Parts in this episode');
		expect(lines[1]).toBe(DISCLOSURE);
		expect(lines.slice(2).every((line) => /^- .*\/go\/[A-Za-z0-9]+$/.test(line))).toBe(true);
		expect(block.problems.join(' ')).not.toMatch(/disclosure/);
		expect(kit.text.indexOf(DISCLOSURE)).toBeLessThan(kit.text.indexOf('/go/'));
		const markdown = await (
			await merch.request(`/api/episodes/${tallboy.id}/publish-kit?format=md`)
		).text();
		expect(markdown).toContain(`## Parts in this episode\n\n${DISCLOSURE}\n\n- [`);
		const page = await (await merch.request(`/episodes/${tallboy.id}/publish`)).text();
		expect(page).toContain(DISCLOSURE);
		expect(page).toContain('data-testid="disclosure-note"');

		const published = await move('locked', 'published');
		expect(published.status).toBe(200);
		expect(await stageOf(tallboy.id)).toBe('published');
	});

	test('a title over the 100 characters platforms take holds the episode back until it is shortened', async () => {
		await backToLocked();
		const [{ version }] = await sql(`SELECT version FROM episode WHERE id = $1`, [tallboy.id]);
		const long = `${tallboy.title}: `.padEnd(110, 'x'); // 110 characters, 10 over
		const renamed = await producer.api(`/api/episodes/${tallboy.id}`, {
			method: 'PATCH',
			json: { title: long, version }
		});
		expect(renamed.status).toBe(200);

		const refused = await move('locked', 'published');
		expect(refused.status).toBe(422);
		expect(refused.body.gate.reasons).toMatchObject([
			{ rule: 'title-refused', subject: 'Title', fixedBy: 'producer' }
		]);
		expect(refused.body.gate.reasons[0].message).toMatch(
			/110 characters; video platforms take 100: shorten it by 10/
		);

		const back = await producer.api(`/api/episodes/${tallboy.id}`, {
			method: 'PATCH',
			json: { title: tallboy.title, version: renamed.body.episode.version }
		});
		expect(back.status).toBe(200);
		expect((await move('locked', 'published')).status).toBe(200);
	});
});
