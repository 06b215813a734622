/**
 * "Named in the script but not linked" on the featured parts list, over HTTP against the built
 * server: which catalogue parts a script names by SKU or by exact name. Pins the matching rules
 * (whole words, case, punctuation and Markdown emphasis around the words, line breaks, runs of at
 * most 12 words, this channel's catalogue only, linked parts left out, SKU order) so the lookup
 * can change how it reads the catalogue without changing what it finds.
 *
 * Outside sources for the checks:
 * - Words are separated by Unicode White_Space (The Unicode Standard, PropList.txt; JavaScript's
 *   `\s`); case is compared after lower-casing (tests/REFERENCES.md, "Database and text").
 * - SKU order is code-point order under the test cluster's C.UTF-8 locale (tests/REFERENCES.md,
 *   "Database and text").
 * - Access control: OWASP ASVS 4.0 V4 (another channel's catalogue is never read).
 * The expected lists below are worked out by hand from those rules.
 */
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { Visitor, demo, signedIn, sql } from '../helpers/http';

let channelId: string;
let otherChannelId: string;
let host: Visitor;
const partIds = new Map<string, string>();

/** A part of the test's own in a channel; SKUs start with FPN- so cleanup finds them. */
async function addPart(channel: string, sku: string, name: string) {
	const [row] = await sql<{ id: string }>(
		`INSERT INTO part (channel_id, sku, name, category, brand, price_cents, currency, store_url, fitment_note, status)
		 VALUES ($1, $2, $3, 'Test', 'Fictional Test Works', 1000, 'USD', 'https://shop.example.test/p', '', 'active') RETURNING id`,
		[channel, sku, name]
	);
	return row.id;
}

let episodeSeq = 0;
/** An episode at 29.97 whose segments carry these scripts, in order. */
async function scriptedEpisode(scripts: string[]): Promise<string> {
	const slug = `named-test-${Date.now()}-${episodeSeq++}`;
	const [episode] = await sql<{ id: string }>(
		`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate, stage, cut_duration_frames) VALUES ($1, $2, $3, 600, '29.97', 'edit', 17982) RETURNING id`,
		[channelId, `Named test ${slug}`, slug]
	);
	for (const [index, body] of scripts.entries()) {
		const [segment] = await sql<{ id: string }>(
			`INSERT INTO segment (episode_id, position, kind, title) VALUES ($1, $2, 'install-step', $3) RETURNING id`,
			[episode.id, index + 1, `Step ${index + 1}`]
		);
		await sql(`INSERT INTO segment_script (segment_id, body) VALUES ($1, $2)`, [segment.id, body]);
	}
	return episode.id;
}

interface Warning {
	kind: string;
	partId: string;
	sku: string;
	message: string;
	blocksLock: boolean;
}

async function namedOf(episodeId: string): Promise<Warning[]> {
	const answer = await host.api(`/api/episodes/${episodeId}/featured-parts`);
	expect(answer.status).toBe(200);
	return (answer.body.warnings as Warning[]).filter((w) => w.kind === 'named-not-linked');
}

beforeAll(async () => {
	channelId = (await sql(`SELECT id FROM channel WHERE name = 'Torquehaven Garage'`))[0].id;
	otherChannelId = (await sql(`SELECT id FROM channel WHERE name = 'Dune Wagon Weekly'`))[0].id;
	host = await signedIn(demo.host);
	const catalogue: [string, string][] = [
		['FPN-AX-100', 'Axle strap, short'],
		['FPN-AX-1000', 'Axle strap, long'],
		['FPN-HB 22', 'Hub bearing, sealed'],
		['FPN-TB-7', 'Quillfen track bar, 2 in, cast'],
		['FPN-BL-9', 'Quillfen brake line set'],
		['FPN-W12', 'one two three four five six seven eight nine ten eleven twelve'],
		['FPN-W13', 'one two three four five six seven eight nine ten eleven twelve thirteen'],
		['FPN-QC-1', '"Quillfen" clamp'],
		['FPN-PA-2', 'Quillfen  pitman arm'],
		['FPN-SK-3', 'Quillfen spacer kit.'],
		['fpn-kx-5', 'Lower-case SKU bracket'],
		['FPN-LK-6', 'Quillfen linked bracket']
	];
	for (const [sku, name] of catalogue) partIds.set(sku, await addPart(channelId, sku, name));
	// The same SKU and name in another channel: never named here.
	await addPart(otherChannelId, 'FPN-AX-100', 'Axle strap, short');
	await addPart(otherChannelId, 'FPN-OTHER-1', 'Quillfen other-channel stand');
});

afterAll(async () => {
	await sql(`DELETE FROM episode WHERE slug LIKE 'named-test-%'`);
	await sql(`DELETE FROM part WHERE sku ILIKE 'fpn-%'`);
});

describe('parts named in the script', () => {
	test('by SKU and by exact name: whole words, any case, punctuation and emphasis around them, across line breaks and segments', async () => {
		const episode = await scriptedEpisode([
			// "fpn-ax-100," names FPN-AX-100 (case, trailing comma); "FPN-AX-1000T" names nothing.
			'Strap it with the fpn-ax-100, then try FPN-AX-1000T on the other side.',
			// A SKU with a space, broken over a line; a name in brackets with a full stop after.
			'Press in the FPN-HB\n22 now. Bolt on the (quillfen TRACK bar, 2 in, cast). ',
			// "setting" is not the whole word "set"; emphasis around a SKU; a lower-case SKU in capitals.
			'Bleed the quillfen brake line setting first. Then **FPN-KX-5** goes on.',
			// A twelve-word name is named; a thirteen-word name is past the longest run.
			'one two three four five six seven eight nine ten eleven twelve thirteen',
			// Quotes that are part of a name match as written; a name ending in a full stop needs it.
			'Tighten the "Quillfen" clamp and the quillfen spacer kit. Then the quillfen pitman arm.',
			// Another channel's part is never named, even by its exact name.
			'Set the Quillfen other-channel stand aside.'
		]);
		const named = await namedOf(episode);
		expect(named.map((w) => w.sku)).toEqual([
			'FPN-AX-100',
			'FPN-HB 22',
			'FPN-QC-1',
			'FPN-SK-3',
			'FPN-TB-7',
			'FPN-W12',
			'fpn-kx-5'
		]);
		// Each one is this channel's part, and none holds up the lock.
		expect(named.map((w) => w.partId)).toEqual(named.map((w) => partIds.get(w.sku)));
		expect(named.every((w) => w.blocksLock === false)).toBe(true);
		expect(named[0].message).toBe(
			'FPN-AX-100 “Axle strap, short” is named in the script but no note links it: link it where it is on screen, or check the script.'
		);
	});

	test('a script that names no part, an empty script, and a named part that a note links', async () => {
		expect(await namedOf(await scriptedEpisode(['Lower the axle onto the stands.']))).toEqual([]);
		expect(await namedOf(await scriptedEpisode(['']))).toEqual([]);

		const episode = await scriptedEpisode(['Fit FPN-LK-6 and FPN-AX-100.']);
		const [note] = await sql<{ id: string }>(
			`INSERT INTO segment_note (episode_id, text) VALUES ($1, 'Bracket on') RETURNING id`,
			[episode]
		);
		await sql(`INSERT INTO segment_note_part (note_id, part_id) VALUES ($1, $2)`, [
			note.id,
			partIds.get('FPN-LK-6')
		]);
		expect((await namedOf(episode)).map((w) => w.sku)).toEqual(['FPN-AX-100']);
	});
});
