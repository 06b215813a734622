/**
 * Spec cards over HTTP against the built server: create, list, change, place, delete; version
 * checks; the CSV and JSON exports for the editor's graphics; the parsers' words on bad input;
 * who may do what.
 *
 * Outside sources for the expected values (written from the sources, not read from the code):
 * - Tyres: handbook arithmetic (tests/REFERENCES.md, "Tyres"): overall diameter =
 *   rim + 2 × width × aspect ÷ 100 ÷ 25.4;
 *   worked examples 265/70R17 → 31.61 in and 285/70R17 → 32.71 in; revolutions per mile = 63,360 ÷ (π × diameter).
 * - Axle height rises by half the diameter increase (common practice); true speed = indicated × new ÷ old diameter.
 * - Torque: NIST SP 811 Appendix B.8, 1 ft·lbf = 1.355818 N·m.
 * - Timecode: SMPTE ST 12-1 drop-frame counting at 29.97 (the spec is paywalled; checked with the npm
 *   package `smpte-timecode`); real time at the exact rate 30000/1001 (tests/REFERENCES.md,
 *   "Frame rates").
 * - CSV: RFC 4180, read back by `papaparse`. Content-Disposition: RFC 6266.
 * - Access control: OWASP ASVS 4.0 V4 (checked on the server, deny by default; other channels 404).
 */
import { createRequire } from 'node:module';
import Papa from 'papaparse';
import { beforeAll, describe, expect, test } from 'vitest';
import { Visitor, demo, signedIn, sql } from '../helpers/http';
import { parseTyreSize } from '$lib/specs';
import { parseTimecode } from '$lib/timecode';

interface SmpteTimecode {
	frameCount: number;
	toString(): string;
}
// smpte-timecode ships CommonJS without types.
const require = createRequire(import.meta.url);
const smpte = require('smpte-timecode') as (
	timecode: number | string,
	rate: [number, number],
	dropFrame: boolean
) => SmpteTimecode;
const dropFrame2997 = (timecode: string | number) => smpte(timecode, [30000, 1001], true);

type Line = { label: string; imperial: string; metric: string };
type CardView = {
	id: string;
	kind: string;
	version: number;
	atFrame: number | null;
	atTimecode: string | null;
	segment: { id: string; title: string } | null;
	card: { heading: string; lines: Line[]; cautions: string[] };
};

/** What the parser itself says about a size: the API must answer with exactly these words. */
function parserMessage(size: string): string {
	try {
		parseTyreSize(size);
	} catch (failure) {
		return (failure as Error).message;
	}
	throw new Error(`${size} parsed; the test expected it to be refused`);
}

function timecodeMessage(text: string): string {
	try {
		parseTimecode(text, '29.97', { dropFrame: true });
	} catch (failure) {
		return (failure as Error).message;
	}
	throw new Error(`${text} parsed; the test expected it to be refused`);
}

const lineOf = (card: CardView['card'], label: string) => {
	const found = card.lines.find((line) => line.label === label);
	if (!found)
		throw new Error(
			`no line ${label} on ${card.heading}: ${card.lines.map((line) => line.label).join(', ')}`
		);
	return found;
};

// Handbook arithmetic, worked here from the formula (tests/REFERENCES.md, "Tyres").
const oldDiameterIn = 17 + (2 * 265 * 70) / 100 / 25.4; // 31.606 in (worked example: 31.61)
const newDiameterIn = 17 + (2 * 285 * 70) / 100 / 25.4; // 32.709 in (worked example: 32.71)
const oldDiameterMm = 17 * 25.4 + (2 * 265 * 70) / 100; // 802.8 mm
const newDiameterMm = 17 * 25.4 + (2 * 285 * 70) / 100; // 830.8 mm
const revsPerMile = (diameterIn: number) => 63_360 / (Math.PI * diameterIn);
const revsPerKm = (diameterMm: number) => 1_000_000 / (Math.PI * diameterMm);

let torquehavenId: string;
const visitors: Partial<
	Record<'producer' | 'host' | 'camera' | 'editor' | 'merch' | 'other' | 'signedOut', Visitor>
> = {};
const editor = () => visitors.editor!;

/** 00:13:40;00 at 29.97 drop-frame, by SMPTE ST 12-1 (smpte-timecode): the cut of every test episode. */
const cutFrames = dropFrame2997('00:13:40;00').frameCount;

let episodeSeq = 0;
/** A fresh Torquehaven episode with a cut and two segments, so each test owns its cards. */
async function newEpisode(): Promise<{ id: string; slug: string; segments: string[] }> {
	const slug = `spec-test-${Date.now()}-${episodeSeq++}`;
	const [episode] = await sql(
		`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate, stage, cut_duration_frames)
		 VALUES ($1, $2, $3, 600, '29.97', 'edit', $4) RETURNING id`,
		[torquehavenId, `Spec test ${slug}`, slug, cutFrames]
	);
	const segments = await sql(
		`INSERT INTO segment (episode_id, position, kind, title) VALUES ($1, 1, 'overview', 'The sizes, explained'), ($1, 2, 'wheels-tyres', 'Mount and torque') RETURNING id`,
		[episode.id]
	);
	return { id: episode.id, slug, segments: segments.map((row) => row.id) };
}

const cardsPath = (episodeId: string) => `/api/episodes/${episodeId}/spec-cards`;

async function addCard(
	episodeId: string,
	body: Record<string, unknown>,
	visitor = editor()
): Promise<CardView> {
	const answer = await visitor.api(cardsPath(episodeId), { method: 'POST', json: body });
	expect(answer.status, JSON.stringify(answer.body)).toBe(201);
	return answer.body;
}

const tyreChange = { kind: 'tyre-change', from: '265/70R17', to: '285/70R17' };
const lugNuts = { kind: 'torque', value: 95, unit: 'ft·lbf', fastener: 'Lug nuts' };

beforeAll(async () => {
	const [channel] = await sql(`SELECT id FROM channel WHERE name = 'Torquehaven Garage'`);
	torquehavenId = channel.id;
	for (const role of ['producer', 'host', 'camera', 'merch'] as const)
		visitors[role] = await signedIn(demo[role]);
	// The shared demo editor is on two crews and may land in the other one: switch, as the channel switcher does.
	visitors.editor = await signedIn(demo.editor);
	expect(
		(
			await visitors.editor.request('/channel?/switch', {
				method: 'POST',
				form: { channelId: torquehavenId }
			})
		).status
	).toBe(303);
	visitors.other = await signedIn(demo.otherProducer);
	visitors.signedOut = new Visitor();
});

describe('the demo spec cards', () => {
	test('the block-lift episode has a lift card and a torque card placed in the cut, each with its caution', async () => {
		const [episode] = await sql(`SELECT id FROM episode WHERE slug = 'mule-rear-block-lift'`);
		const answer = await visitors.host!.api(cardsPath(episode.id));
		expect(answer.status).toBe(200);
		const cards: CardView[] = answer.body.cards;
		expect(cards.map((card) => card.kind)).toEqual(['lift', 'torque']);
		const [lift, torque] = cards;
		// 00:04:48;00 at 29.97 drop-frame: 288 × 30 − 2 × 4 = 8632 frames (SMPTE ST 12-1, smpte-timecode).
		expect(lift.atFrame).toBe(dropFrame2997('00:04:48;00').frameCount);
		expect(lift.atFrame).toBe(8632);
		expect(lift.atTimecode).toBe('00:04:48;00');
		expect(lift.segment?.title).toBe('Tapered block in, pinion angle checked');
		// 3 in × 25.4 mm (exact, NIST SP 811) = 76.2 → 76 mm; 2 in = 50.8 → 51 mm; rake rear minus front = +1 in.
		expect(lineOf(lift.card, 'Rear lift')).toMatchObject({ imperial: '3 in', metric: '76 mm' });
		expect(lineOf(lift.card, 'Front lift')).toMatchObject({ imperial: '2 in', metric: '51 mm' });
		expect(lineOf(lift.card, 'Rake change (rear minus front)')).toMatchObject({
			imperial: '+1 in',
			metric: '+25 mm'
		});
		expect(lift.card.cautions.join(' ')).toMatch(
			/local laws on vehicle height, lighting and bumper height/
		);
		expect(lift.card.cautions.join(' ')).toMatch(/licensed professional/);
		expect(torque.segment?.title).toBe('New U-bolts, torqued in a cross pattern');
		expect(torque.card.cautions).toContain("Verify against the manufacturer's instructions.");
	});

	test('the tyre episode has its tyre-change card on the numbers segment, not placed yet (no cut)', async () => {
		const [episode] = await sql(`SELECT id FROM episode WHERE slug = 'mule-285-tyres'`);
		const answer = await visitors.merch!.api(cardsPath(episode.id));
		expect(answer.status).toBe(200);
		// The browser test may add placed cards to this episode; the seeded one is the unplaced tyre change.
		const card = (answer.body.cards as CardView[]).find(
			(candidate) => candidate.kind === 'tyre-change' && candidate.atFrame === null
		)!;
		expect(card).toBeDefined();
		expect(card.card.heading).toBe('265/70R17 → 285/70R17');
		expect(card.atFrame).toBeNull();
		expect(card.segment?.title).toBe('The numbers: diameter and clearance');
	});
});

describe('creating and reading cards', () => {
	test('a tyre-change card reads the handbook figures for 265/70R17 → 285/70R17, imperial and metric', async () => {
		const episode = await newEpisode();
		const created = await addCard(episode.id, {
			input: tyreChange,
			segmentId: episode.segments[0],
			at: '00:02:10;00'
		});
		expect(oldDiameterIn).toBeCloseTo(31.61, 2); // worked example in tests/REFERENCES.md, "Tyres"
		expect(newDiameterIn).toBeCloseTo(32.71, 2);
		const card = created.card;
		expect(lineOf(card, 'Overall diameter')).toMatchObject({
			imperial: '31.6 in → 32.7 in',
			metric: '803 mm → 831 mm'
		});
		// 32.71 − 31.61 = 1.10 in; 830.8 − 802.8 = 28 mm.
		expect(lineOf(card, 'Diameter change')).toMatchObject({
			imperial: '+1.1 in',
			metric: '+28 mm'
		});
		// Half the diameter change (common practice): 1.1024 in ÷ 2 = 0.5512 in, shown to 0.01 in
		// because it is half of a figure shown to 0.1 in; 28 mm ÷ 2 = 14 mm.
		expect(lineOf(card, 'Axle height change (half the diameter change)')).toMatchObject({
			imperial: '+0.55 in',
			metric: '+14 mm'
		});
		// 285 − 265 = 20 mm = 0.787 in.
		expect(lineOf(card, 'Width change')).toMatchObject({ imperial: '+0.8 in', metric: '+20 mm' });
		// 60 × 32.71 ÷ 31.61 = 62.09 mph; 100 × 32.71 ÷ 31.61 = 103.48 km/h.
		expect(lineOf(card, 'True speed at an indicated 60 mph / 100 km/h')).toMatchObject({
			imperial: `${((60 * newDiameterIn) / oldDiameterIn).toFixed(1)} mph`,
			metric: `${((100 * newDiameterIn) / oldDiameterIn).toFixed(1)} km/h`
		});
		expect(lineOf(card, 'True speed at an indicated 60 mph / 100 km/h')).toMatchObject({
			imperial: '62.1 mph',
			metric: '103.5 km/h'
		});
		// 63,360 ÷ (π × 32.709) − 63,360 ÷ (π × 31.606) = 616.6 − 638.1 = −21.5 per mile; 383.1 − 396.5 = −13.4 per km.
		expect(revsPerMile(newDiameterIn) - revsPerMile(oldDiameterIn)).toBeCloseTo(-21.5, 1);
		expect(lineOf(card, 'Revolutions change')).toMatchObject({
			imperial: '-22 per mile',
			metric: '-13 per km'
		});
		expect(revsPerKm(newDiameterMm) - revsPerKm(oldDiameterMm)).toBeCloseTo(-13.4, 1);
		expect(card.cautions.join(' ')).toMatch(/speedometer and odometer read low/);

		// 00:02:10;00 at 29.97 drop-frame: (130 × 30) − 2 × 2 = 3896 frames (SMPTE ST 12-1, smpte-timecode).
		expect(created.atFrame).toBe(dropFrame2997('00:02:10;00').frameCount);
		expect(created.atFrame).toBe(3896);
		expect(created.atTimecode).toBe('00:02:10;00');
		expect(created.segment?.title).toBe('The sizes, explained');
		expect(created.version).toBe(1);
	});

	test('a torque card converts with the NIST SP 811 factor and always carries the verify caution', async () => {
		const episode = await newEpisode();
		const created = await addCard(episode.id, {
			input: lugNuts,
			segmentId: episode.segments[1],
			at: '8:00'
		});
		// NIST SP 811 B.8: 95 ft·lbf × 1.355818 = 128.80 N·m → 129 N·m.
		expect(created.card.lines).toEqual([
			{ label: 'Torque', imperial: '95 ft·lbf', metric: `${Math.round(95 * 1.355818)} N·m` }
		]);
		expect(created.card.lines[0].metric).toBe('129 N·m');
		expect(created.card.heading).toBe('Lug nuts');
		expect(created.card.cautions).toContain("Verify against the manufacturer's instructions.");

		// Typed in N·m: 140 ÷ 1.355818 = 103.26 ft·lbf → 103 ft·lbf.
		const metric = await addCard(episode.id, {
			input: { kind: 'torque', value: 140, unit: 'N·m' }
		});
		expect(metric.card.lines[0]).toMatchObject({ imperial: '103 ft·lbf', metric: '140 N·m' });
		expect(metric.card.cautions).toContain("Verify against the manufacturer's instructions.");
	});

	test('the list is in program-time order with unplaced cards last, and a card attaches to no segment too', async () => {
		const episode = await newEpisode();
		await addCard(episode.id, { input: lugNuts, at: '9:00' });
		await addCard(episode.id, {
			input: { kind: 'text', heading: 'Re-torque', body: 'Check the U-bolts again after 50 miles.' }
		});
		await addCard(episode.id, { input: tyreChange, at: '1:00' });
		const answer = await visitors.camera!.api(cardsPath(episode.id));
		expect(answer.status).toBe(200);
		const cards: CardView[] = answer.body.cards;
		expect(cards.map((card) => card.kind)).toEqual(['tyre-change', 'torque', 'text']);
		expect(cards[2].atFrame).toBeNull();
		expect(cards[2].segment).toBeNull();
		expect(answer.body.segments.map((segment: { title: string }) => segment.title)).toEqual([
			'The sizes, explained',
			'Mount and torque'
		]);
	});
});

describe('bad input answers 400 with the parser’s own words', () => {
	let episodeId: string;
	beforeAll(async () => {
		episodeId = (await newEpisode()).id;
	});

	test.each([
		['285/70', 'no rim'],
		['R17', 'no width'],
		['285/105R17', 'aspect ratio over 100']
	])(
		'the new size %s (%s) is refused with the tyre parser’s message on the field',
		async (size) => {
			const answer = await editor().api(cardsPath(episodeId), {
				method: 'POST',
				json: { input: { ...tyreChange, to: size } }
			});
			expect(answer.status).toBe(400);
			expect(answer.body.error).toBe(parserMessage(size));
			expect(answer.body.issues['input.to']).toEqual([parserMessage(size)]);
		}
	);

	test('an aspect ratio over 100 is named as such', async () => {
		const answer = await editor().api(cardsPath(episodeId), {
			method: 'POST',
			json: { input: { kind: 'tyre', size: '285/105R17' } }
		});
		expect(answer.status).toBe(400);
		expect(answer.body.error).toMatch(/Aspect ratio 105 is over 100/);
	});

	test.each([
		['00:04:61:00', 'seconds past 59'],
		['00:01:00;00', 'a label drop-frame skips (SMPTE ST 12-1: ;00 and ;01 at minute 1)'],
		['four minutes', 'words']
	])('the program time %s (%s) is refused with the timecode parser’s message', async (at) => {
		const answer = await editor().api(cardsPath(episodeId), {
			method: 'POST',
			json: { input: lugNuts, at }
		});
		expect(answer.status).toBe(400);
		expect(answer.body.error).toBe(timecodeMessage(at));
		expect(answer.body.issues.at).toEqual([timecodeMessage(at)]);
	});

	test('a time at or after the end of the cut is refused', async () => {
		const answer = await editor().api(cardsPath(episodeId), {
			method: 'POST',
			json: { input: lugNuts, at: '00:13:40;00' }
		});
		expect(answer.status).toBe(400);
		expect(answer.body.issues.at[0]).toMatch(/end of the cut \(00:13:40;00\)/);
	});

	test('a torque of zero, a missing unit, a segment of another episode and an unknown kind are refused and nothing is stored', async () => {
		const other = await newEpisode();
		const zero = await editor().api(cardsPath(episodeId), {
			method: 'POST',
			json: { input: { ...lugNuts, value: 0 } }
		});
		expect(zero.status).toBe(400);
		expect(zero.body.error).toBe('Torque must be more than zero.');
		const noUnit = await editor().api(cardsPath(episodeId), {
			method: 'POST',
			json: { input: { kind: 'torque', value: 95 } }
		});
		expect(noUnit.status).toBe(400);
		expect(noUnit.body.issues['input.unit'][0]).toMatch(/Choose a torque unit/);
		const foreignSegment = await editor().api(cardsPath(episodeId), {
			method: 'POST',
			json: { input: lugNuts, segmentId: other.segments[0] }
		});
		expect(foreignSegment.status).toBe(400);
		expect(foreignSegment.body.issues.segmentId[0]).toMatch(/not in this episode’s rundown/);
		const unknownKind = await editor().api(cardsPath(episodeId), {
			method: 'POST',
			json: { input: { kind: 'wheel', size: '17x8' } }
		});
		expect(unknownKind.status).toBe(400);
		expect(await sql(`SELECT id FROM spec_card WHERE episode_id = $1`, [episodeId])).toEqual([]);
	});

	test('an unknown export format is a 400 that names the ones there are', async () => {
		const answer = await editor().api(`${cardsPath(episodeId)}?format=xlsx`);
		expect(answer.status).toBe(400);
		expect(answer.body.error).toMatch(/csv or json/);
	});
});

describe('changing, placing and removing cards', () => {
	test('a change with the version read succeeds; a stale version answers 409 with the current card', async () => {
		const episode = await newEpisode();
		const created = await addCard(episode.id, { input: lugNuts, at: '8:00' });
		const path = `${cardsPath(episode.id)}/${created.id}`;
		const changed = await editor().api(path, {
			method: 'PATCH',
			json: { version: 1, input: { ...lugNuts, value: 100 } }
		});
		expect(changed.status).toBe(200);
		expect(changed.body.version).toBe(2);
		// NIST SP 811 B.8: 100 × 1.355818 = 135.58 → 136 N·m.
		expect(changed.body.card.lines[0]).toMatchObject({ imperial: '100 ft·lbf', metric: '136 N·m' });

		const stale = await visitors.producer!.api(path, {
			method: 'PATCH',
			json: { version: 1, input: { ...lugNuts, value: 80 } }
		});
		expect(stale.status).toBe(409);
		expect(stale.body.current.version).toBe(2);
		expect(stale.body.current.card.lines[0].imperial).toBe('100 ft·lbf');
		const [row] = await sql(`SELECT input, version FROM spec_card WHERE id = $1`, [created.id]);
		expect(row).toEqual({ input: { ...lugNuts, value: 100 }, version: 2 });
	});

	test('placing by frame, moving to another segment and taking a card off the cut', async () => {
		const episode = await newEpisode();
		const created = await addCard(episode.id, { input: tyreChange });
		const path = `${cardsPath(episode.id)}/${created.id}`;
		const placed = await editor().api(path, {
			method: 'PATCH',
			json: { version: 1, atFrame: 17982, segmentId: episode.segments[1], durationSeconds: 40 }
		});
		expect(placed.status).toBe(200);
		// 17982 frames are exactly 10 minutes of 29.97 drop-frame (SMPTE ST 12-1).
		expect(placed.body.atTimecode).toBe('00:10:00;00');
		expect(placed.body.segment.title).toBe('Mount and torque');
		// 40 s × 30000/1001 = 1198.8 → 1199 frames (the card's 629 characters need 37 s to read).
		expect(placed.body.durationFrames).toBe(1199);
		const cleared = await editor().api(path, {
			method: 'PATCH',
			json: { version: 2, at: null, segmentId: null }
		});
		expect(cleared.status).toBe(200);
		expect(cleared.body.atFrame).toBeNull();
		expect(cleared.body.segment).toBeNull();
	});

	test('delete with a stale version is 409; with the current one the card is gone; again is 404', async () => {
		const episode = await newEpisode();
		const created = await addCard(episode.id, { input: lugNuts });
		const path = `${cardsPath(episode.id)}/${created.id}`;
		await editor().api(path, { method: 'PATCH', json: { version: 1, at: '3:00' } });
		expect((await editor().api(`${path}?version=1`, { method: 'DELETE' })).status).toBe(409);
		const removed = await editor().api(`${path}?version=2`, { method: 'DELETE' });
		expect(removed.status).toBe(200);
		expect(removed.body.removed.id).toBe(created.id);
		expect(await sql(`SELECT id FROM spec_card WHERE id = $1`, [created.id])).toEqual([]);
		expect((await editor().api(path, { method: 'DELETE' })).status).toBe(404);
		expect(
			(
				await editor().api(`${cardsPath(episode.id)}/not-a-uuid`, {
					method: 'PATCH',
					json: { version: 1, at: '1:00' }
				})
			).status
		).toBe(404);
	});

	test('removing the segment keeps the card and clears its segment', async () => {
		const episode = await newEpisode();
		const created = await addCard(episode.id, { input: lugNuts, segmentId: episode.segments[1] });
		await sql(`DELETE FROM segment WHERE id = $1`, [episode.segments[1]]);
		const [row] = await sql(`SELECT segment_id FROM spec_card WHERE id = $1`, [created.id]);
		expect(row.segment_id).toBeNull();
	});
});

describe('the export for the graphics', () => {
	let episode: { id: string; slug: string; segments: string[] };
	beforeAll(async () => {
		episode = await newEpisode();
		await addCard(episode.id, {
			input: lugNuts,
			segmentId: episode.segments[1],
			at: '00:08:00;02',
			durationSeconds: 5
		});
		await addCard(episode.id, {
			input: tyreChange,
			segmentId: episode.segments[0],
			at: '00:02:10;00'
		});
		await addCard(episode.id, {
			input: {
				kind: 'text',
				heading: 'Parts, "as fitted"',
				body: 'Blocks, U-bolts, shocks: all linked below.'
			}
		});
	});

	test('CSV: papaparse reads one row per card in program-time order, with every number from the sources', async () => {
		const response = await editor().request(`${cardsPath(episode.id)}?format=csv`);
		expect(response.status).toBe(200);
		expect(response.headers.get('content-type')).toMatch(/^text\/csv; charset=utf-8/);
		expect(response.headers.get('content-disposition')).toBe(
			`attachment; filename="${episode.slug}-spec-cards.csv"`
		);
		const body = await response.text();
		// RFC 4180 §2: records end in CRLF.
		expect(body.endsWith('\r\n')).toBe(true);
		const parsed = Papa.parse<Record<string, string>>(body, { header: true, skipEmptyLines: true });
		expect(parsed.errors).toEqual([]);
		expect(parsed.data.map((row) => row.kind)).toEqual(['tyre-change', 'torque', 'text']);
		const [tyres, torque, text] = parsed.data;

		expect(tyres).toMatchObject({
			segment_position: '1',
			segment_title: 'The sizes, explained',
			// 3896 frames (SMPTE ST 12-1) × 1001/30000 s = 129.9965 s → 129.997.
			start_timecode: '00:02:10;00',
			start_seconds: ((3896 * 1001) / 30000).toFixed(3),
			heading: '265/70R17 → 285/70R17',
			line_1_label: 'Overall diameter',
			line_1_imperial: '31.6 in → 32.7 in',
			line_1_metric: '803 mm → 831 mm',
			line_2_imperial: '+1.1 in',
			line_2_metric: '+28 mm',
			line_3_imperial: '+0.55 in',
			line_3_metric: '+14 mm',
			line_5_imperial: '62.1 mph',
			line_5_metric: '103.5 km/h'
		});
		expect(tyres.start_seconds).toBe('129.997');
		// No time typed: the card's reading time, longer than the 6 s default: 629 characters ÷ 17
		// = 37 s (tests/REFERENCES.md, "Reading speed"); 37 s × 30000/1001 = 1108.9 → 1109 frames
		// = 37.004 s.
		expect(tyres.duration_seconds).toBe('37.004');
		expect(tyres.cautions.split('\n')[0]).toMatch(/speedometer and odometer read low/);

		// 00:08:00;02 (;00 and ;01 are skipped at minute 8): 480 × 30 + 2 − 2 × 8 = 14386 frames (SMPTE ST 12-1) = 480.013 s.
		expect(dropFrame2997('00:08:00;02').frameCount).toBe(14386);
		expect(torque).toMatchObject({
			start_timecode: '00:08:00;02',
			start_seconds: ((14386 * 1001) / 30000).toFixed(3)
		});
		expect(torque.start_seconds).toBe('480.013');
		// NIST SP 811 B.8: 95 ft·lbf = 128.80 N·m.
		expect(torque).toMatchObject({
			heading: 'Lug nuts',
			line_1_label: 'Torque',
			line_1_imperial: '95 ft·lbf',
			line_1_metric: '129 N·m',
			line_2_label: ''
		});
		expect(torque.cautions).toBe("Verify against the manufacturer's instructions.");
		// 5 s × 30000/1001 = 149.85 → 150 frames; ends at 14386 + 150 = 14536.
		expect(torque.duration_seconds).toBe('5.005');
		expect(torque.end_timecode).toBe(dropFrame2997(14536).toString());

		// RFC 4180: the comma and the quotes survive the round trip.
		expect(text).toMatchObject({
			heading: 'Parts, "as fitted"',
			body: 'Blocks, U-bolts, shocks: all linked below.',
			start_timecode: '',
			start_seconds: ''
		});
	});

	test('JSON: the same cards with their lines and exact figures, matching the worked examples and NIST SP 811', async () => {
		const answer = await visitors.host!.api(`${cardsPath(episode.id)}?format=json`);
		expect(answer.status).toBe(200);
		expect(answer.headers.get('content-type')).toMatch(/^application\/json/);
		expect(answer.headers.get('content-disposition')).toBe(
			`attachment; filename="${episode.slug}-spec-cards.json"`
		);
		const { episode: exported, cards } = answer.body;
		expect(exported).toMatchObject({ slug: episode.slug, frameRate: '29.97', dropFrame: true });
		expect(cards.map((card: { kind: string }) => card.kind)).toEqual([
			'tyre-change',
			'torque',
			'text'
		]);
		const [tyres, torque] = cards;
		// tests/REFERENCES.md, "Tyres", worked examples: 31.61 in and 32.71 in; axle +0.55 in
		// (half of 1.10); speedometer 32.71 / 31.61.
		expect(tyres.figures.fromDiameterIn).toBeCloseTo(31.61, 2);
		expect(tyres.figures.toDiameterIn).toBeCloseTo(32.71, 2);
		expect(tyres.figures.diameterChangeIn).toBeCloseTo(1.1, 2);
		expect(tyres.figures.axleHeightChangeIn).toBeCloseTo(0.55, 2);
		expect(tyres.figures.speedometerFactor).toBeCloseTo(32.71 / 31.61, 3);
		expect(tyres.start).toEqual({ frame: 3896, timecode: '00:02:10;00', seconds: '129.997' });
		expect(tyres.lines[0]).toEqual({
			label: 'Overall diameter',
			imperial: '31.6 in → 32.7 in',
			metric: '803 mm → 831 mm'
		});
		// NIST SP 811 B.8: 1 ft·lbf = 1.355818 N·m.
		expect(torque.figures.newtonMetres).toBeCloseTo(95 * 1.355818, 6);
		expect(torque.figures.footPoundsForce).toBe(95);
		expect(torque.cautions).toEqual(["Verify against the manufacturer's instructions."]);
	});
});

describe('who may do what', () => {
	let episode: { id: string; slug: string; segments: string[] };
	let card: CardView;
	beforeAll(async () => {
		episode = await newEpisode();
		card = await addCard(episode.id, { input: lugNuts, at: '2:00' });
	});

	test('every crew member reads the list and the export; signed out is 401', async () => {
		for (const role of ['producer', 'host', 'camera', 'editor', 'merch'] as const) {
			expect((await visitors[role]!.api(cardsPath(episode.id))).status, role).toBe(200);
			expect(
				(await visitors[role]!.request(`${cardsPath(episode.id)}?format=csv`)).status,
				role
			).toBe(200);
		}
		expect((await visitors.signedOut!.api(cardsPath(episode.id))).status).toBe(401);
		expect(
			(
				await visitors.signedOut!.api(cardsPath(episode.id), {
					method: 'POST',
					json: { input: lugNuts }
				})
			).status
		).toBe(401);
	});

	test('the editor and the producer write; host, camera and merch get 403 and change nothing', async () => {
		expect(
			(
				await visitors.producer!.api(cardsPath(episode.id), {
					method: 'POST',
					json: { input: lugNuts }
				})
			).status
		).toBe(201);
		for (const role of ['host', 'camera', 'merch'] as const) {
			const visitor = visitors[role]!;
			expect(
				(await visitor.api(cardsPath(episode.id), { method: 'POST', json: { input: lugNuts } }))
					.status,
				role
			).toBe(403);
			expect(
				(
					await visitor.api(`${cardsPath(episode.id)}/${card.id}`, {
						method: 'PATCH',
						json: { version: card.version, at: '3:00' }
					})
				).status,
				role
			).toBe(403);
			expect(
				(await visitor.api(`${cardsPath(episode.id)}/${card.id}`, { method: 'DELETE' })).status,
				role
			).toBe(403);
		}
		const [row] = await sql(`SELECT version, at_frame FROM spec_card WHERE id = $1`, [card.id]);
		expect(row).toEqual({ version: 1, at_frame: card.atFrame });
	});

	test('a producer of another channel gets 404 for everything here, and changes nothing', async () => {
		const other = visitors.other!;
		expect((await other.api(cardsPath(episode.id))).status).toBe(404);
		expect((await other.api(`${cardsPath(episode.id)}?format=json`)).status).toBe(404);
		expect(
			(await other.api(cardsPath(episode.id), { method: 'POST', json: { input: lugNuts } })).status
		).toBe(404);
		expect(
			(
				await other.api(`${cardsPath(episode.id)}/${card.id}`, {
					method: 'PATCH',
					json: { version: card.version, at: '3:00' }
				})
			).status
		).toBe(404);
		expect(
			(await other.api(`${cardsPath(episode.id)}/${card.id}`, { method: 'DELETE' })).status
		).toBe(404);
		expect((await other.request(`/episodes/${episode.id}/spec-cards`)).status).toBe(404);
		const [row] = await sql(`SELECT version FROM spec_card WHERE id = $1`, [card.id]);
		expect(row.version).toBe(1);
	});

	test('the page works without JavaScript: the editor adds a card through the form action, host is refused', async () => {
		// Without JavaScript the kind is picked with ?kind=, and the page renders that kind's fields.
		const torqueFields = await (
			await editor().request(`/episodes/${episode.id}/spec-cards?kind=torque`, {
				headers: { accept: 'text/html' }
			})
		).text();
		expect(torqueFields).toContain('for="card-value"');
		expect(torqueFields).not.toContain('for="card-from"');
		const form = {
			kind: 'torque',
			value: '120',
			unit: 'N·m',
			fastener: 'Shock bolts',
			segmentId: '',
			at: '5:00',
			durationSeconds: '6'
		};
		const added = await editor().action(`/episodes/${episode.id}/spec-cards?/save`, form);
		expect(added.type).toBe('redirect');
		const [row] = await sql(
			`SELECT input FROM spec_card WHERE episode_id = $1 AND input->>'fastener' = 'Shock bolts'`,
			[episode.id]
		);
		expect(row.input).toEqual({ kind: 'torque', value: 120, unit: 'N·m', fastener: 'Shock bolts' });
		const refused = await visitors.host!.action(`/episodes/${episode.id}/spec-cards?/save`, form);
		expect(refused.status).toBe(403);
		const bad = await editor().action(`/episodes/${episode.id}/spec-cards?/save`, {
			...form,
			kind: 'tyre-change',
			from: '265/70R17',
			to: '285/70'
		});
		expect(bad.type).toBe('failure');
		expect(bad.status).toBe(400);
		expect(bad.data.errors.to).toEqual([parserMessage('285/70')]);
		expect(bad.data.values.to).toBe('285/70');
	});
});
