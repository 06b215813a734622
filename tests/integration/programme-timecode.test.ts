/**
 * An episode's programme timecode over HTTP against the built server: drop-frame or non-drop and a
 * start offset set on the episode, then read and shown the same way by the edit timeline, chapters
 * and their CSV, notes, cautions and spec cards; description chapters stay counted from 0:00.
 *
 * Outside sources for the checks:
 * - Timecode: SMPTE ST 12-1 (paywalled; counts checked with the npm package `smpte-timecode`):
 *   01:00:00:00 at 29.97 is label 108000 non-drop, 107892 drop-frame (tests/REFERENCES.md, "Timecode").
 * - A sequence starting at 01:00:00:00: common practice of edit systems (tests/REFERENCES.md,
 *   "Timecode", start offsets; from memory).
 * - Description timestamps start at 0:00: common practice of video platforms (tests/REFERENCES.md,
 *   "Description timestamps").
 * - CSV: RFC 4180, read back by `papaparse`.
 * - Bad input: OWASP ASVS 4.0.3 V5 (validated on the server; a field-level 400, never a 500).
 */
import { createRequire } from 'node:module';
import Papa from 'papaparse';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { Visitor, demo, signedIn, sql } from '../helpers/http';

const smpte = createRequire(import.meta.url)('smpte-timecode') as (
	timecode: number | string,
	rate: [number, number],
	dropFrame: boolean
) => { frameCount: number; add(frames: number): { toString(): string } };

let channelId: string;
const visitors = {} as Record<'producer' | 'editor' | 'camera', Visitor>;

let episodeSeq = 0;
/** A fresh episode in the edit stage; the default two-hour cut fits any label up to 02:00. */
async function newEpisode(rate = '29.97', cutFrames = 216000): Promise<string> {
	const slug = `tc-test-${Date.now()}-${episodeSeq++}`;
	const [row] = await sql(
		`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate, stage, cut_duration_frames)
		 VALUES ($1, $2, $3, 600, $4, 'edit', $5) RETURNING id`,
		[channelId, `Timecode test ${slug}`, slug, rate, cutFrames]
	);
	return row.id;
}

/** The producer sets the programme timecode through the episode API, naming the version read. */
async function setTimecode(episodeId: string, json: Record<string, unknown>) {
	const current = await visitors.producer.api(`/api/episodes/${episodeId}`);
	expect(current.status).toBe(200);
	return visitors.producer.api(`/api/episodes/${episodeId}`, {
		method: 'PATCH',
		json: { version: current.body.episode.version, ...json }
	});
}

async function addChapter(episodeId: string, start: string, title: string) {
	const answer = await visitors.editor.api(`/api/episodes/${episodeId}/chapters`, {
		method: 'POST',
		json: { start, title }
	});
	expect(answer.status, JSON.stringify(answer.body)).toBe(201);
	return answer.body.chapter as { startFrame: number; startTimecode: string };
}

beforeAll(async () => {
	channelId = (await sql(`SELECT id FROM channel WHERE name = 'Torquehaven Garage'`))[0].id;
	visitors.producer = await signedIn(demo.producer);
	visitors.camera = await signedIn(demo.camera);
	visitors.editor = await signedIn(demo.editor);
	// The shared editor starts in the other channel (channels sort by name): switch as the switcher does.
	expect(
		(await visitors.editor.request('/channel?/switch', { method: 'POST', form: { channelId } }))
			.status
	).toBe(303);
});

afterAll(async () => {
	await sql(`DELETE FROM episode WHERE slug LIKE 'tc-test-%'`);
});

describe('non-drop programme timecode at 29.97', () => {
	test('01:00:00:00 typed on a non-drop timeline lands on frame 108000, not 107892', async () => {
		const id = await newEpisode();
		const saved = await setTimecode(id, { timecodeDropFrame: false });
		expect(saved.status, JSON.stringify(saved.body)).toBe(200);
		expect(saved.body.episode.timecodeDropFrame).toBe(false);
		const chapter = await addChapter(id, '01:00:00:00', 'An hour in');
		// SMPTE ST 12-1 non-drop: 3600 × 30 = 108000 labels; smpte-timecode agrees.
		expect(chapter.startFrame).toBe(smpte('01:00:00:00', [30000, 1001], false).frameCount);
		expect(chapter.startFrame).toBe(108000);
		expect(chapter.startTimecode).toBe('01:00:00:00');
	});

	test('without a choice the episode stays drop-frame, as before', async () => {
		const id = await newEpisode();
		const chapter = await addChapter(id, '01:00:00;00', 'An hour in');
		// SMPTE ST 12-1 drop-frame: 6 × 17982 = 107892 (tests/REFERENCES.md, "Timecode").
		expect(chapter.startFrame).toBe(smpte('01:00:00;00', [30000, 1001], true).frameCount);
		expect(chapter.startTimecode).toBe('01:00:00;00');
	});
});

describe('a start offset of 01:00:00:00, non-drop', () => {
	let id: string;
	beforeAll(async () => {
		// A ten-minute cut: 18000 non-drop frames at 29.97.
		id = await newEpisode('29.97', 18000);
		const saved = await setTimecode(id, {
			timecodeDropFrame: false,
			timecodeStart: '01:00:00:00'
		});
		expect(saved.status, JSON.stringify(saved.body)).toBe(200);
		expect(saved.body.episode.timecodeStart).toBe('01:00:00:00');
		await addChapter(id, '01:00:00:00', 'Intro');
		await addChapter(id, '01:00:10:00', 'Tools');
		await addChapter(id, '0:40', 'Jack stands');
	});

	test('typed labels take the offset off; a clock time counts from the start of the cut', async () => {
		const answer = await visitors.editor.api(`/api/episodes/${id}/chapters`);
		expect(answer.status).toBe(200);
		const chapters = answer.body.chapters as { startFrame: number; startTimecode: string }[];
		// 01:00:10:00 − 01:00:00:00 = 10 s of non-drop labels = 300 frames (SMPTE ST 12-1).
		expect(chapters.map((chapter) => chapter.startFrame)).toEqual([0, 300, 1199]);
		// The labels are the start plus the position, as smpte-timecode adds them; 0:40 is the first
		// frame at or after 40 s: ⌈40 × 30000/1001⌉ = 1199 (tests/REFERENCES.md, "Frame rates").
		expect(chapters.map((chapter) => chapter.startTimecode)).toEqual(
			[0, 300, 1199].map((frames) =>
				smpte('01:00:00:00', [30000, 1001], false).add(frames).toString()
			)
		);
		expect(answer.body.episode).toMatchObject({ dropFrame: false, timecodeStart: '01:00:00:00' });
		// The cut's length stays a length: 18000 non-drop frames are ten minutes of labels.
		expect(answer.body.cut.timecode).toBe('00:10:00:00');
	});

	test('the edit timeline page shows the offset labels and where the timecode starts', async () => {
		const page = await visitors.editor.request(`/episodes/${id}/edit`);
		expect(page.status).toBe(200);
		const html = await page.text();
		expect(html).toContain('01:00:10:00');
		expect(html).toContain('timecode from 01:00:00:00');
		expect(html).not.toContain('00:00:10:00');
	});

	test('the chapter CSV carries offset labels; the description text still starts at 0:00', async () => {
		const csv = await visitors.editor.api(`/api/episodes/${id}/chapters?format=csv`);
		expect(csv.status).toBe(200);
		const rows = Papa.parse<Record<string, string>>(String(csv.body), {
			header: true,
			skipEmptyLines: true
		}).data;
		expect(rows.map((row) => row.start_timecode)).toEqual([
			'01:00:00:00',
			'01:00:10:00',
			'01:00:39:29'
		]);
		// Seconds count real time from the start of the cut: 300 × 1001/30000 = 10.010 s.
		expect(rows[1].start_seconds).toBe('10.010');
		const text = await visitors.editor.api(`/api/episodes/${id}/chapters?format=txt`);
		expect(text.status).toBe(200);
		// Video platforms read description chapters from 0:00 (common practice), never 1:00:00.
		expect(String(text.body).split('\n').slice(0, 3)).toEqual([
			'0:00 Intro',
			'0:10 Tools',
			'0:40 Jack stands'
		]);
	});

	test('a note placed at 01:00:20:00 sits 600 frames in and shows that label on the notes page', async () => {
		const created = await visitors.camera.api(`/api/episodes/${id}/notes`, {
			method: 'POST',
			json: { text: 'Lift block on the bench' }
		});
		expect(created.status, JSON.stringify(created.body)).toBe(201);
		const placed = await visitors.editor.api(`/api/notes/${created.body.note.id}`, {
			method: 'PATCH',
			json: { version: created.body.note.version, programTime: '01:00:20:00' }
		});
		expect(placed.status, JSON.stringify(placed.body)).toBe(200);
		// 20 s of non-drop labels at 30 a second (SMPTE ST 12-1).
		expect(placed.body.note.programFrame).toBe(600);
		expect(placed.body.note.programTimecode).toBe('01:00:20:00');
		const page = await visitors.editor.request(`/episodes/${id}/notes`);
		expect(page.status).toBe(200);
		const html = await page.text();
		expect(html).toContain('01:00:20:00');
		// Svelte's server output may put comment markers and line breaks between text and values.
		const words = html.replace(/<!--.*?-->/g, '').replace(/\s+/g, ' ');
		expect(words, words.slice(words.indexOf('fps'), words.indexOf('fps') + 80)).toContain(
			'timecode from 01:00:00:00'
		);
	});

	test('a caution placed at 01:00:30:00 is 900 frames into the cut', async () => {
		const segment = await visitors.producer.api(`/api/episodes/${id}/segments`, {
			method: 'POST',
			json: {
				kind: 'install-step',
				title: 'Jack it',
				plannedSeconds: 30,
				hazards: ['raised-vehicle']
			}
		});
		expect(segment.status, JSON.stringify(segment.body)).toBe(201);
		const caution = segment.body.segment.cautions[0];
		const placed = await visitors.producer.api(
			`/api/segments/${segment.body.segment.id}/cautions/raised-vehicle`,
			{ method: 'PATCH', json: { at: '01:00:30:00', version: caution.version } }
		);
		expect(placed.status, JSON.stringify(placed.body)).toBe(200);
		expect(placed.body.caution.atFrame).toBe(900);
		expect(placed.body.caution.atTimecode).toBe('01:00:30:00');
	});

	test('the spec-card export labels a card’s start and end with the offset', async () => {
		const card = await visitors.editor.api(`/api/episodes/${id}/spec-cards`, {
			method: 'POST',
			json: {
				input: { kind: 'torque', value: 95, unit: 'ft·lbf', fastener: 'Lug nuts' },
				at: '01:01:00:00',
				durationSeconds: 5
			}
		});
		expect(card.status, JSON.stringify(card.body)).toBe(201);
		// One minute of non-drop labels: 1800 frames (SMPTE ST 12-1).
		expect(card.body.card?.atFrame ?? card.body.atFrame).toBe(1800);
		const csv = await visitors.editor.api(`/api/episodes/${id}/spec-cards?format=csv`);
		expect(csv.status).toBe(200);
		const [row] = Papa.parse<Record<string, string>>(String(csv.body), {
			header: true,
			skipEmptyLines: true
		}).data;
		expect(row.start_timecode).toBe('01:01:00:00');
		// 5 s at 29.97 is ⌊5 × 30000/1001⌉ = 150 frames: the end label is 150 frames later.
		expect(row.end_timecode).toBe(smpte('01:01:00:00', [30000, 1001], false).add(150).toString());
		expect(row.start_seconds).toBe('60.060');
	});
});

describe('bad timecode settings and times get a field-level 400, never a 500', () => {
	test('a start that is not a timecode is refused on its field', async () => {
		const id = await newEpisode();
		for (const start of ['one hour', '1:00:00', '25:00:00:00', '01:60:00:00']) {
			const answer = await setTimecode(id, { timecodeStart: start });
			expect(answer.status, start).toBe(400);
			expect(answer.body.issues.timecodeStart[0], start).toMatch(/HH:MM:SS:FF|past a day|minutes/);
		}
		const row = (await sql(`SELECT timecode_start FROM episode WHERE id = $1`, [id]))[0];
		expect(row.timecode_start).toBe('00:00:00:00');
	});

	test('a skipped drop-frame label as the start, or frames past the rate, are refused', async () => {
		const id = await newEpisode();
		// SMPTE ST 12-1: ;00 and ;01 do not exist at minute 01 in drop-frame.
		const skipped = await setTimecode(id, { timecodeStart: '01:01:00:00' });
		expect(skipped.status).toBe(400);
		expect(skipped.body.issues.timecodeStart[0]).toMatch(/doesn't exist in drop-frame/);
		const rate25 = await newEpisode('25');
		const frames = await setTimecode(rate25, { timecodeStart: '01:00:00:25' });
		expect(frames.status).toBe(400);
		expect(frames.body.issues.timecodeStart[0]).toMatch(/frames go from 00 to 24/);
	});

	test('drop-frame at 25 fps is refused on its field', async () => {
		const id = await newEpisode('25');
		const answer = await setTimecode(id, { timecodeDropFrame: true });
		expect(answer.status).toBe(400);
		expect(answer.body.issues.timecodeDropFrame[0]).toMatch(/only exists at 29\.97 and 59\.94/);
		const wrongType = await setTimecode(id, { timecodeDropFrame: 'yes' });
		expect(wrongType.status).toBe(400);
		expect(wrongType.body.issues.timecodeDropFrame[0]).toMatch(/drop-frame or non-drop/);
	});

	test('a time typed before the start offset names the start', async () => {
		const id = await newEpisode();
		expect((await setTimecode(id, { timecodeStart: '01:00:00:00' })).status).toBe(200);
		const answer = await visitors.editor.api(`/api/episodes/${id}/chapters`, {
			method: 'POST',
			json: { start: '00:04:30;00', title: 'Too early' }
		});
		expect(answer.status).toBe(400);
		expect(answer.body.issues.start[0]).toMatch(
			/before the start of this cut's timecode \(01:00:00;00\)/
		);
	});

	test('the details form keeps what was typed and shows the start field’s message', async () => {
		const id = await newEpisode();
		const [{ version }] = await sql(`SELECT version FROM episode WHERE id = $1`, [id]);
		const result = await visitors.producer.action(`/episodes/${id}?/save`, {
			version: String(version),
			title: 'Timecode test',
			targetRuntime: '10:00',
			frameRate: '29.97',
			timecodeForm: 'non-drop',
			timecodeStart: '1 o’clock',
			publishDate: ''
		});
		expect(result.type).toBe('failure');
		expect(result.status).toBe(400);
		expect(result.data.errors.timecodeStart[0]).toMatch(/HH:MM:SS:FF/);
		expect(result.data.values.timecodeStart).toBe('1 o’clock');
		const saved = await visitors.producer.action(`/episodes/${id}?/save`, {
			version: String(version),
			title: 'Timecode test',
			targetRuntime: '10:00',
			frameRate: '29.97',
			timecodeForm: 'non-drop',
			timecodeStart: '01:00:00:00',
			publishDate: ''
		});
		expect(saved.type, JSON.stringify(saved)).toBe('success');
		const row = (
			await sql(`SELECT timecode_drop_frame, timecode_start FROM episode WHERE id = $1`, [id])
		)[0];
		expect(row).toEqual({ timecode_drop_frame: false, timecode_start: '01:00:00:00' });
	});
});
