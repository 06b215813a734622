/**
 * Markers out to an edit system and chapter markers back in, over HTTP against the built server.
 *
 * Outside sources for the checks:
 * - Timecode: SMPTE ST 12-1 (paywalled); every label in the files is turned back into a frame with
 *   the npm package `smpte-timecode` (tests/REFERENCES.md, "Timecode").
 * - EDL: CMX 3600 header and locator lines (tests/REFERENCES.md, "Edit-system exchange"; from memory).
 * - OpenTimelineIO: the published serialized schema's field names, RationalTime rate and value
 *   (tests/REFERENCES.md, "Edit-system exchange").
 * - Content-Disposition: RFC 6266 (`attachment; filename="…"`).
 * - Access control and input: OWASP ASVS 4.0.3 V4 (role and channel checked on the server; another
 *   channel's episode is 404) and V5 (field-level 400, row-level 422, never a 500).
 */
import { createRequire } from 'node:module';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { Visitor, demo, signedIn, sql } from '../helpers/http';
import { approvedCutFixture } from '../helpers/cut-review';

const smpte = createRequire(import.meta.url)('smpte-timecode') as (
	timecode: number | string,
	rate: [number, number] | number,
	dropFrame: boolean
) => { frameCount: number };

let channelId: string;
const visitors = {} as Record<'producer' | 'editor' | 'camera' | 'other', Visitor>;
const markersPath = (episodeId: string) => `/api/episodes/${episodeId}/markers`;

let episodeSeq = 0;
async function newEpisode(rate: string, start: string, cutFrames: number): Promise<string> {
	const slug = `markers-test-${Date.now()}-${episodeSeq++}`;
	const [row] = await sql(
		`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate, stage, cut_duration_frames, timecode_start)
		 VALUES ($1, $2, $3, 600, $4, 'edit', $5, $6) RETURNING id`,
		[channelId, `Markers test ${slug}`, slug, rate, cutFrames, start]
	);
	return row.id;
}

async function addChapters(episodeId: string, chapters: [number, string][]) {
	for (const [frame, title] of chapters)
		await sql(`INSERT INTO chapter (episode_id, start_frame, title) VALUES ($1, $2, $3)`, [
			episodeId,
			frame,
			title
		]);
}

const chaptersIn = async (episodeId: string) =>
	(
		await sql(
			`SELECT start_frame, title, version FROM chapter WHERE episode_id = $1 ORDER BY start_frame, title`,
			[episodeId]
		)
	).map((row) => [row.start_frame, row.title, row.version]);

beforeAll(async () => {
	channelId = (await sql(`SELECT id FROM channel WHERE name = 'Torquehaven Garage'`))[0].id;
	visitors.producer = await signedIn(demo.producer);
	visitors.camera = await signedIn(demo.camera);
	visitors.editor = await signedIn(demo.editor);
	visitors.other = await signedIn(demo.otherProducer);
	// The shared editor starts in the other channel (channels sort by name): switch as the switcher does.
	expect(
		(await visitors.editor.request('/channel?/switch', { method: 'POST', form: { channelId } }))
			.status
	).toBe(303);
});

afterAll(async () => {
	await sql(`DELETE FROM episode WHERE slug LIKE 'markers-test-%'`);
});

describe('export at 29.97 drop-frame from 01:00:00;00', () => {
	let id: string;
	let specFrame: number;
	beforeAll(async () => {
		id = await newEpisode('29.97', '01:00:00:00', 20000);
		await addChapters(id, [
			[0, 'Opening and the plan'],
			[1800, 'Tools laid out'],
			[9000, 'Torque and wrap']
		]);
		const [segment] = await sql(
			`INSERT INTO segment (episode_id, position, kind, title, hazards) VALUES ($1, 1, 'install-step', 'Jack it up', ARRAY['raised-vehicle']) RETURNING id`,
			[id]
		);
		await sql(
			`INSERT INTO caution (segment_id, hazard, text, at_frame, duration_frames) VALUES ($1, 'raised-vehicle', 'Support the vehicle on rated stands; never work under a jack alone.', 3600, 150)`,
			[segment.id]
		);
		const card = await visitors.editor.api(`/api/episodes/${id}/spec-cards`, {
			method: 'POST',
			json: {
				input: { kind: 'torque', value: 95, unit: 'ft·lbf', fastener: 'Lug nuts' },
				at: '01:05:00;02'
			}
		});
		expect(card.status, JSON.stringify(card.body)).toBe(201);
		// SMPTE ST 12-1: 01:05:00;02 is 5 × 1798 + 2 = 8992 frames after 01:00:00;00 (smpte-timecode agrees).
		specFrame = smpte('01:05:00;02', [30000, 1001], true).frameCount - 107892;
		expect(specFrame).toBe(8992);
	});

	test('any crew member downloads the EDL; every locator sits on its frame', async () => {
		const response = await visitors.camera.request(`${markersPath(id)}?format=edl`);
		expect(response.status).toBe(200);
		expect(response.headers.get('content-type')).toMatch(/^text\/plain/);
		// RFC 6266: a download with the episode's slug as the file name.
		expect(response.headers.get('content-disposition')).toMatch(
			/^attachment; filename="markers-test-[\w-]+-markers\.edl"$/
		);
		const text = await response.text();
		expect(text.split('\n')[1]).toBe('FCM: DROP FRAME');
		const locators = text
			.split('\n')
			.filter((line) => line.startsWith('* LOC: '))
			.map((line) => {
				const [, , timecode, kind] = line.split(' ');
				return [smpte(timecode, [30000, 1001], true).frameCount - 107892, kind];
			});
		expect(locators).toEqual([
			[0, 'CHAPTER'],
			[1800, 'CHAPTER'],
			[3600, 'CAUTION'],
			[specFrame, 'SPEC'],
			[9000, 'CHAPTER']
		]);
		// The caution card's words travel with it, so the safety note reaches the edit system.
		expect(text).toContain(
			'* NOTE: Support the vehicle on rated stands; never work under a jack alone.'
		);
		expect(text).toMatch(/SPEC Torque: Lug nuts\n\* NOTE: .*95 ft·lbf/);
	});

	test('the OpenTimelineIO file places the same markers at rate 30000/1001 from 107892', async () => {
		const answer = await visitors.producer.api(`${markersPath(id)}?format=otio`);
		expect(answer.status).toBe(200);
		expect(answer.headers.get('content-disposition')).toMatch(/-markers\.otio"$/);
		const timeline = answer.body;
		expect(timeline.OTIO_SCHEMA).toBe('Timeline.1');
		expect(timeline.global_start_time).toEqual({
			OTIO_SCHEMA: 'RationalTime.1',
			rate: 30000 / 1001,
			value: 107892
		});
		const markers = timeline.tracks.markers as {
			OTIO_SCHEMA: string;
			name: string;
			marked_range: { start_time: { rate: number; value: number }; duration: { value: number } };
		}[];
		expect(markers.every((marker) => marker.OTIO_SCHEMA === 'Marker.2')).toBe(true);
		expect(markers.map((marker) => marker.marked_range.start_time.value)).toEqual([
			0,
			1800,
			3600,
			specFrame,
			9000
		]);
		// Chapters run to the next one, the last to the cut's end; the caution for its time on screen.
		expect(markers.map((marker) => marker.marked_range.duration.value)).toEqual([
			1800,
			7200,
			150,
			expect.any(Number),
			11000
		]);
	});

	test('another channel’s producer gets 404, a signed-out caller 401, a bad format a field error', async () => {
		expect((await visitors.other.api(`${markersPath(id)}?format=edl`)).status).toBe(404);
		expect((await new Visitor().api(`${markersPath(id)}?format=edl`)).status).toBe(401);
		const bad = await visitors.editor.api(`${markersPath(id)}?format=xml`);
		expect(bad.status).toBe(400);
		expect(bad.body.issues.format[0]).toMatch(/edl or otio/);
		expect((await visitors.editor.api(`${markersPath('not-an-id')}?format=edl`)).status).toBe(404);
	});
});

describe('export at 25 fps from 01:00:00:00', () => {
	test('open review comments travel as markers; answered ones stay home', async () => {
		const id = await newEpisode('25', '01:00:00:00', 3000);
		await approvedCutFixture(id);
		const [version] = await sql(`SELECT id FROM cut_version WHERE episode_id = $1`, [id]);
		const post = (json: Record<string, unknown>) =>
			visitors.producer.api(`/api/episodes/${id}/cut/comments`, {
				method: 'POST',
				json: { versionId: version.id, ...json }
			});
		// A range from 01:00:10:00 to 01:00:12:12 on the programme clock: frames 250 to 312 at 25
		// labels a second (SMPTE ST 12-1, hand-worked: 10 s × 25 = 250; 12 s 12 fr = 312).
		const range = await post({ atFrame: 250, untilFrame: 312, body: 'Hold on the lug pattern' });
		expect(range.status, JSON.stringify(range.body)).toBe(201);
		const done = await post({ atFrame: 500, body: 'Already fixed' });
		expect(done.status).toBe(201);
		await sql(
			`UPDATE cut_comment SET state = 'resolved' WHERE body = 'Already fixed' AND episode_id = $1`,
			[id]
		);
		const edl = await (await visitors.editor.request(`${markersPath(id)}?format=edl`)).text();
		const locators = edl.split('\n').filter((line) => line.startsWith('* LOC: '));
		expect(locators).toHaveLength(1);
		expect(locators[0]).toMatch(/^\* LOC: 01:00:10:00 COMMENT Review v1: /);
		expect(smpte('01:00:10:00', 25, false).frameCount - 90000).toBe(250);
		expect(edl).toContain('* NOTE: Hold on the lug pattern');
		const otio = (await visitors.editor.api(`${markersPath(id)}?format=otio`)).body;
		const markers = otio.tracks.markers;
		expect(markers).toHaveLength(1);
		// OpenTimelineIO: a marker's marked_range is a TimeRange of RationalTimes (start, duration).
		expect(markers[0].marked_range.start_time).toMatchObject({ rate: 25, value: 250 });
		expect(markers[0].marked_range.duration).toMatchObject({ rate: 25, value: 62 });
	});

	test('labels are non-drop from the one-hour start in both files', async () => {
		const id = await newEpisode('25', '01:00:00:00', 3000);
		await addChapters(id, [
			[0, 'Intro'],
			[37, 'Bleeder screws'],
			[1500, 'Pedal feel']
		]);
		const edl = await (await visitors.editor.request(`${markersPath(id)}?format=edl`)).text();
		expect(edl.split('\n')[1]).toBe('FCM: NON-DROP FRAME');
		const labels = edl
			.split('\n')
			.filter((line) => line.startsWith('* LOC: '))
			.map((line) => line.split(' ')[2]);
		// Hand-worked at 25 labels a second: 37 = 1 s 12 fr, 1500 = 60 s (SMPTE ST 12-1).
		expect(labels).toEqual(['01:00:00:00', '01:00:01:12', '01:01:00:00']);
		expect(labels.map((label) => smpte(label, 25, false).frameCount - 90000)).toEqual([
			0, 37, 1500
		]);
		const otio = (await visitors.editor.api(`${markersPath(id)}?format=otio`)).body;
		expect(otio.global_start_time).toEqual({
			OTIO_SCHEMA: 'RationalTime.1',
			rate: 25,
			value: 90000
		});
		expect(
			otio.tracks.markers.map(
				(marker: { marked_range: { start_time: unknown } }) => marker.marked_range.start_time
			)
		).toEqual([0, 37, 1500].map((value) => ({ OTIO_SCHEMA: 'RationalTime.1', rate: 25, value })));
	});
});

describe('import chapter markers', () => {
	let id: string;
	const edlBack = [
		'TITLE: Back from the edit bay',
		'FCM: DROP FRAME',
		'',
		'001  AX       V     C        01:00:00;00 01:00:00;01 01:00:00;00 01:00:00;01',
		'* LOC: 01:00:00;00 GREEN   Opening and the plan',
		'* LOC: 01:01:00;02 CHAPTER Tools and safety gear',
		'* LOC: 01:05:00;02 CHAPTER Torque and wrap',
		'* LOC: 01:08:00;02 CHAPTER Test drive',
		'* LOC: 01:02:00;04 CAUTION Caution: Raised vehicle'
	].join('\r\n');

	beforeAll(async () => {
		id = await newEpisode('29.97', '01:00:00:00', 20000);
		await addChapters(id, [
			[0, 'Opening and the plan'],
			[1800, 'Tools'],
			[9000, 'Torque and wrap']
		]);
	});

	const post = (json: Record<string, unknown>, visitor = visitors.editor) =>
		visitor.api(markersPath(id), { method: 'POST', json });

	test('the preview says what would change and writes nothing', async () => {
		const before = await chaptersIn(id);
		const answer = await post({ fileName: 'back.edl', text: edlBack });
		expect(answer.status, JSON.stringify(answer.body)).toBe(200);
		const preview = answer.body.preview;
		expect(preview.counts).toEqual({ added: 1, moved: 1, renamed: 1, unchanged: 1 });
		expect(preview.skipped).toBe(1);
		expect(
			preview.changes.map((change: { change: string; timecode: string }) => [
				change.change,
				change.timecode
			])
		).toEqual([
			['unchanged', '01:00:00;00'],
			['renamed', '01:01:00;02'],
			['moved', '01:05:00;02'],
			['added', '01:08:00;02']
		]);
		expect(preview.changes[2].fromTimecode).toBe('01:05:00;10');
		expect(preview.lock).toBeNull();
		expect(await chaptersIn(id)).toEqual(before);
	});

	test('confirm writes the previewed changes in one go', async () => {
		const { body } = await post({ fileName: 'back.edl', text: edlBack });
		const answer = await post({
			fileName: 'back.edl',
			text: edlBack,
			confirm: true,
			basis: body.preview.basis
		});
		expect(answer.status, JSON.stringify(answer.body)).toBe(200);
		// 01:05:00;02 = frame 8992, 01:08:00;02 = 8 × 1798 + 2 = 14386 (SMPTE ST 12-1; smpte-timecode agrees).
		expect(smpte('01:08:00;02', [30000, 1001], true).frameCount - 107892).toBe(14386);
		expect(await chaptersIn(id)).toEqual([
			[0, 'Opening and the plan', 1],
			[1800, 'Tools and safety gear', 2],
			[8992, 'Torque and wrap', 2],
			[14386, 'Test drive', 1]
		]);
		expect(answer.body.state.chapters).toHaveLength(4);
	});

	test('a confirm on a list that changed since its preview is refused with a fresh preview', async () => {
		const { body } = await post({
			fileName: 'back.edl',
			text: edlBack.replace('Test drive', 'Road test')
		});
		await sql(
			`UPDATE chapter SET title = 'Intro', version = version + 1 WHERE episode_id = $1 AND start_frame = 0`,
			[id]
		);
		const before = await chaptersIn(id);
		const answer = await post({
			fileName: 'back.edl',
			text: edlBack.replace('Test drive', 'Road test'),
			confirm: true,
			basis: body.preview.basis
		});
		expect(answer.status).toBe(409);
		expect(answer.body.preview.changes[0].change).toBe('renamed');
		expect(await chaptersIn(id)).toEqual(before);
	});

	test('bad rows come back with line numbers (EDL) and item paths (OTIO), nothing written', async () => {
		const before = await chaptersIn(id);
		const edl = await post({
			fileName: 'bad.edl',
			text: 'TITLE: x\nFCM: DROP FRAME\n* LOC: 01:01:00;00 CHAPTER Skipped label\n* LOC: 00:10:00;00 CHAPTER Too early\n'
		});
		expect(edl.status).toBe(422);
		expect(edl.body.rows.map((row: { where: string }) => row.where)).toEqual(['line 3', 'line 4']);
		expect(edl.body.rows[1].message).toMatch(/before the start/);
		const otio = await post({
			fileName: 'bad.otio',
			text: JSON.stringify({
				OTIO_SCHEMA: 'Timeline.1',
				tracks: { OTIO_SCHEMA: 'Stack.1', markers: [{ OTIO_SCHEMA: 'Marker.2', name: 'No time' }] }
			})
		});
		expect(otio.status).toBe(422);
		expect(otio.body.rows[0].where).toBe('tracks.markers[0].marked_range.start_time');
		// A binary file is not text at all: refused on its field, as every text field refuses
		// control characters (OWASP ASVS V5), before any row is read.
		const garbage = await post({ fileName: 'photo.edl', text: '\u0000\u0001PNG garbage' });
		expect(garbage.status).toBe(400);
		expect(garbage.body.issues.text[0]).toMatch(/invisible control character/);
		expect(await chaptersIn(id)).toEqual(before);
	});

	test('the request is checked field by field: empty, oversized, confirm without a preview', async () => {
		const empty = await post({ text: '' });
		expect(empty.status).toBe(400);
		expect(empty.body.issues.text[0]).toMatch(/empty/);
		const huge = await post({ text: '* LOC: '.padEnd(600 * 1024, 'x') });
		expect(huge.status).toBe(400);
		expect(huge.body.issues.text[0]).toMatch(/larger than 512 KB/);
		const blind = await post({ text: edlBack, confirm: true });
		expect(blind.status).toBe(400);
		expect(blind.body.issues.basis[0]).toMatch(/preview first/);
		const extra = await post({ text: edlBack, sneaky: 1 });
		expect(extra.status).toBe(400);
	});

	test('only the editor and the producer import, and only in their own channel', async () => {
		expect((await post({ text: edlBack }, visitors.camera)).status).toBe(403);
		expect((await post({ text: edlBack }, visitors.other)).status).toBe(404);
		expect((await post({ text: edlBack }, visitors.producer)).status).toBe(200);
	});

	test('a published episode (its chapters fixed by the stage) shows the lock in the preview and refuses the confirm', async () => {
		const locked = await newEpisode('29.97', '01:00:00:00', 20000);
		await addChapters(locked, [[0, 'Opening and the plan']]);
		await sql(`UPDATE episode SET stage = 'published' WHERE id = $1`, [locked]);
		const path = markersPath(locked);
		const preview = await visitors.editor.api(path, { method: 'POST', json: { text: edlBack } });
		expect(preview.status).toBe(200);
		expect(preview.body.preview.lock).toMatch(/published/);
		const confirm = await visitors.editor.api(path, {
			method: 'POST',
			json: { text: edlBack, confirm: true, basis: preview.body.preview.basis }
		});
		expect(confirm.status).toBe(409);
		expect(confirm.body.error).toMatch(/published/);
		expect(await chaptersIn(locked)).toEqual([[0, 'Opening and the plan', 1]]);
	});
});
