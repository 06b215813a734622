/**
 * The edit over HTTP against the built server: the cut's length, chapters (create, move, rename,
 * delete), the chapter rules reported per chapter, version checks, the five exports and who may
 * do what.
 *
 * Outside sources for the checks:
 * - Timecode: SMPTE ST 12-1 drop-frame counting (the spec is paywalled; checked with the npm
 *   package `smpte-timecode`); real time at the exact rate 30000/1001 (tests/REFERENCES.md,
 *   "Frame rates").
 * - WebVTT: W3C WebVTT, read back by `webvtt-parser` (the W3C validator's parser), zero errors.
 * - FFmpeg metadata: ffmpeg-formats "Metadata", read back by `ffmeta` (modelled on FFmpeg's
 *   ffmetadec.c), and by ffprobe where Debian's ffmpeg is installed.
 * - CSV: RFC 4180, read back by `papaparse`.
 * - JSON: Podcasting 2.0 JSON chapters v1.2 (podcast namespace, docs/examples/chapters/jsonChapters.md).
 * - Chapter rules: common practice of video platforms for description chapters (from memory).
 * - Content-Disposition: RFC 6266 (`attachment; filename="…"`).
 * - Access control: OWASP ASVS 4.0 V4 (checked on the server, deny by default; other channels 404).
 */
import { execFileSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { CamelCasePlugin, Kysely, PostgresDialect } from 'kysely';
import Papa from 'papaparse';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, inject, test } from 'vitest';
import { Visitor, demo, signedIn, sql } from '../helpers/http';
import { parseTimecode, TimecodeError } from '$lib/timecode';
import { chapterProblemsFor } from '$lib/server/edit/edit';
import type { Database } from '$lib/server/db/types';

interface WebVttCue {
	startTime: number;
	endTime: number;
	tree: WebVttNode;
}
interface WebVttNode {
	type?: string;
	value?: string;
	children?: WebVttNode[];
}
interface FfmetadataDocument {
	chapters: { TIMEBASE?: string; START: string; END: string; metadata: Record<string, string> }[];
}
interface SmpteTimecode {
	frameCount: number;
	toString(): string;
}

// The reference packages ship CommonJS without types their exports map can reach.
const require = createRequire(import.meta.url);
const { WebVTTParser } = require('webvtt-parser') as {
	WebVTTParser: new (entities?: Record<string, string>) => {
		parse(text: string, mode: 'chapters'): { cues: WebVttCue[]; errors: { message: string }[] };
	};
};
// Its README: pass html-entities.json for the spec's full set of character references.
const htmlEntities = require('webvtt-parser/html-entities.json') as Record<string, string>;
const { parse: parseFfmetadata } = require('ffmeta') as { parse(text: string): FfmetadataDocument };
const smpte = require('smpte-timecode') as (
	timecode: number | string,
	rate: [number, number] | number,
	dropFrame: boolean
) => SmpteTimecode;

const cueText = (node: WebVttNode): string =>
	node.type === 'text' ? (node.value ?? '') : (node.children ?? []).map(cueText).join('');

/** Whole milliseconds of a frame count at 29.97 (30000/1001), rounded half up once, in exact integers. */
const milliseconds2997 = (frames: number) =>
	Number((2n * BigInt(frames) * 1001n * 1000n + 30000n) / 60000n);

let torquehavenId: string;
let otherChannelEpisodeId: string;
const visitors: Partial<
	Record<'producer' | 'host' | 'camera' | 'editor' | 'merch' | 'other', Visitor>
> = {};
const editor = () => visitors.editor!;

/** The shared demo editor is on two crews; put them in Torquehaven, as the channel switcher does. */
async function inTorquehaven(email: string): Promise<Visitor> {
	const visitor = await signedIn(email);
	const switched = await visitor.request('/channel?/switch', {
		method: 'POST',
		form: { channelId: torquehavenId }
	});
	expect(switched.status).toBe(303);
	return visitor;
}

let episodeSeq = 0;
/** A fresh episode of the Torquehaven channel, so each test owns its chapters. */
async function newEpisode(
	options: { rate?: string; cut?: number | null; slug?: string; stage?: string } = {}
): Promise<{ id: string; slug: string }> {
	const slug = options.slug ?? `edit-test-${Date.now()}-${episodeSeq++}`;
	const [row] = await sql(
		`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate, stage, cut_duration_frames)
		 VALUES ($1, $2, $3, 600, $4, $6, $5) RETURNING id`,
		[
			torquehavenId,
			`Test episode ${slug}`,
			slug,
			options.rate ?? '29.97',
			options.cut ?? null,
			options.stage ?? 'edit'
		]
	);
	return { id: row.id, slug };
}

const chaptersPath = (episodeId: string) => `/api/episodes/${episodeId}/chapters`;

async function addChapters(
	episodeId: string,
	chapters: { startFrame?: number; start?: string; title: string; url?: string }[]
) {
	const created = [];
	for (const chapter of chapters) {
		const answer = await editor().api(chaptersPath(episodeId), { method: 'POST', json: chapter });
		expect(answer.status, JSON.stringify(answer.body)).toBe(201);
		created.push(answer.body.chapter);
	}
	return created;
}

beforeAll(async () => {
	const [channel] = await sql(`SELECT id FROM channel WHERE name = 'Torquehaven Garage'`);
	torquehavenId = channel.id;
	const [sandpiper] = await sql(`SELECT id FROM episode WHERE slug = 'sandpiper-brake-refresh'`);
	otherChannelEpisodeId = sandpiper.id;
	for (const role of ['producer', 'host', 'camera', 'merch'] as const)
		visitors[role] = await signedIn(demo[role]);
	visitors.editor = await inTorquehaven(demo.editor);
	visitors.other = await signedIn(demo.otherProducer);
});

describe('the demo edit', () => {
	test('the episode in the edit stage has a 13:40 cut and a valid chapter list', async () => {
		const [episode] = await sql(`SELECT id FROM episode WHERE slug = 'mule-rear-block-lift'`);
		const answer = await visitors.host!.api(chaptersPath(episode.id));
		expect(answer.status).toBe(200);
		// SMPTE ST 12-1 drop-frame count of 00:13:40;00 at 29.97, per the smpte-timecode package.
		expect(answer.body.cut.durationFrames).toBe(
			smpte('00:13:40;00', [30000, 1001], true).frameCount
		);
		expect(answer.body.cut.timecode).toBe('00:13:40;00');
		expect(answer.body.chapters.length).toBeGreaterThanOrEqual(3);
		expect(answer.body.problems).toEqual([]);
	});

	test('the published episode has its full chapter set, ready to export', async () => {
		const [episode] = await sql(`SELECT id FROM episode WHERE slug = 'tallboy-coil-spacers'`);
		const answer = await visitors.merch!.api(`${chaptersPath(episode.id)}?format=txt`);
		expect(answer.status).toBe(200);
		const lines = String(answer.body).trim().split('\n');
		expect(lines.length).toBeGreaterThanOrEqual(8);
		// Description timestamps start at 0:00 (common practice of video platforms).
		expect(lines[0]).toMatch(/^0:00 /);
	});
});

describe('the cut’s length', () => {
	test('typed as drop-frame timecode, it is counted per SMPTE ST 12-1', async () => {
		const { id } = await newEpisode();
		const answer = await editor().api(`/api/episodes/${id}/cut`, {
			method: 'PATCH',
			json: { duration: '00:13:40;00' }
		});
		expect(answer.status).toBe(200);
		// (820 s × 30 + 0) − 2 × (13 − 1) = 24576, and smpte-timecode agrees.
		expect(answer.body.cut.durationFrames).toBe(24576);
		expect(smpte('00:13:40;00', [30000, 1001], true).frameCount).toBe(24576);
		expect(
			(await sql(`SELECT cut_duration_frames FROM episode WHERE id = $1`, [id]))[0]
				.cut_duration_frames
		).toBe(24576);
	});

	test('typed as a clock time, it is the nearest frame at the exact rate 30000/1001', async () => {
		const { id } = await newEpisode();
		const clock = await editor().api(`/api/episodes/${id}/cut`, {
			method: 'PATCH',
			json: { duration: '13:40' }
		});
		expect(clock.status).toBe(200);
		// 820 s × 30000 / 1001 = 24575.42… → 24575 (tests/REFERENCES.md, "Frame rates").
		expect(clock.body.cut.durationFrames).toBe(24575);
		const withMillis = await visitors.producer!.api(`/api/episodes/${id}/cut`, {
			method: 'PATCH',
			json: { duration: '1:02:03.500' }
		});
		// 3723.5 s × 30000 / 1001 = 111593.41… → 111593.
		expect(withMillis.body.cut.durationFrames).toBe(111593);
	});

	test('at 25 fps, non-drop timecode counts 25 frames a second', async () => {
		const { id } = await newEpisode({ rate: '25' });
		const answer = await editor().api(`/api/episodes/${id}/cut`, {
			method: 'PATCH',
			json: { duration: '00:10:00:00' }
		});
		expect(answer.body.cut.durationFrames).toBe(smpte('00:10:00:00', 25, false).frameCount);
		expect(answer.body.cut.durationFrames).toBe(15000);
	});

	test.each([
		['00:01:00;00', '29.97'], // a dropped label (SMPTE ST 12-1): ;00 and ;01 skipped at minute 1
		['00:00:10:30', '29.97'], // frames go to 29
		['00:61:00', '25'],
		['ten minutes', '25'],
		['01:00:00;00', '25'] // drop-frame doesn't exist at 25 fps
	])('“%s” at %s fps is refused with the timecode module’s own words', async (typed, rate) => {
		const { id } = await newEpisode({ rate });
		const answer = await editor().api(`/api/episodes/${id}/cut`, {
			method: 'PATCH',
			json: { duration: typed }
		});
		expect(answer.status).toBe(400);
		let expected = '';
		try {
			parseTimecode(typed, rate as '25', { dropFrame: rate === '29.97' });
		} catch (failure) {
			expect(failure).toBeInstanceOf(TimecodeError);
			expected = (failure as Error).message;
		}
		expect(expected).not.toBe('');
		expect(answer.body.error).toBe(expected);
		expect(answer.body.issues.duration).toEqual([expected]);
		expect(
			(await sql(`SELECT cut_duration_frames FROM episode WHERE id = $1`, [id]))[0]
				.cut_duration_frames
		).toBeNull();
	});

	test('a length of zero is refused, and a stale expected length answers 409 with the current one', async () => {
		const { id } = await newEpisode({ cut: 9000 });
		expect(
			(
				await editor().api(`/api/episodes/${id}/cut`, {
					method: 'PATCH',
					json: { duration: '0:00' }
				})
			).status
		).toBe(400);
		const stale = await editor().api(`/api/episodes/${id}/cut`, {
			method: 'PATCH',
			json: { duration: '6:00', expectedFrames: 1234 }
		});
		expect(stale.status).toBe(409);
		expect(stale.body.current.durationFrames).toBe(9000);
		const fresh = await editor().api(`/api/episodes/${id}/cut`, {
			method: 'PATCH',
			json: { duration: '6:00', expectedFrames: 9000 }
		});
		expect(fresh.status).toBe(200);
		// 360 s × 30000/1001 = 10789.2 → 10789.
		expect(fresh.body.cut.durationFrames).toBe(10789);
	});
});

describe('chapters', () => {
	test('created at a timecode, a clock time or a frame, moved, renamed and deleted', async () => {
		const { id } = await newEpisode({ cut: 24576 });
		const [first, second, third] = await addChapters(id, [
			{ start: '00:00:00;00', title: 'Cold open' },
			{ start: '1:05', title: 'Chock the wheels' },
			{ startFrame: 5000, title: 'Break the U-bolts loose' }
		]);
		expect(first.startFrame).toBe(0);
		// A clock time goes to the first frame at or after it: ⌈65 s × 30000/1001⌉ = ⌈1948.05⌉ = 1949.
		expect(second.startFrame).toBe(1949);
		expect(third.startFrame).toBe(5000);
		// The timecode shown is drop-frame, as smpte-timecode writes frame 5000 at 29.97 DF.
		expect(third.startTimecode).toBe(smpte(5000, [30000, 1001], true).toString());

		const moved = await editor().api(`${chaptersPath(id)}/${second.id}`, {
			method: 'PATCH',
			json: { version: second.version, start: '00:02:00;04' }
		});
		expect(moved.status).toBe(200);
		// 00:02:00;04 at 29.97 DF: 120 × 30 + 4 − 2 × 2 = 3600 (SMPTE ST 12-1; smpte-timecode agrees).
		expect(moved.body.chapter.startFrame).toBe(
			smpte('00:02:00;04', [30000, 1001], true).frameCount
		);
		expect(moved.body.chapter.startFrame).toBe(3600);
		expect(moved.body.chapter.version).toBe(second.version + 1);
		// The list comes back in start order (3600 is still before 5000).
		expect(moved.body.state.chapters.map((chapter: { id: string }) => chapter.id)).toEqual([
			first.id,
			second.id,
			third.id
		]);

		const renamed = await visitors.producer!.api(`${chaptersPath(id)}/${third.id}`, {
			method: 'PATCH',
			json: { version: third.version, title: 'Drop the axle onto stands' }
		});
		expect(renamed.status).toBe(200);
		expect((await sql(`SELECT title, version FROM chapter WHERE id = $1`, [third.id]))[0]).toEqual({
			title: 'Drop the axle onto stands',
			version: 2
		});

		const removed = await editor().api(`${chaptersPath(id)}/${first.id}?version=${first.version}`, {
			method: 'DELETE'
		});
		expect(removed.status).toBe(200);
		expect(removed.body.state.chapters).toHaveLength(2);
		expect(await sql(`SELECT id FROM chapter WHERE id = $1`, [first.id])).toEqual([]);
		expect(
			(await editor().api(`${chaptersPath(id)}/${first.id}`, { method: 'DELETE' })).status
		).toBe(404);
	});

	test('a chapter names a part of its own channel only; removing that part clears the link and keeps the chapter', async () => {
		const { id } = await newEpisode({ cut: 24576 });
		const [ours] = await sql(`SELECT id FROM part WHERE channel_id = $1 LIMIT 1`, [torquehavenId]);
		const [theirs] = await sql(
			`INSERT INTO part (channel_id, sku, brand, name, category, price_cents, currency, store_url)
			 SELECT id, $2, 'Kingbolt Suspension', 'Other channel part', 'Test', 100, 'USD', 'https://shop.dunewagon.test/p/other'
			 FROM channel WHERE id <> $1 LIMIT 1 RETURNING id`,
			[torquehavenId, `OTHER-CHANNEL-${Date.now()}`]
		);

		const linked = await editor().api(chaptersPath(id), {
			method: 'POST',
			json: { startFrame: 0, title: 'Cold open', partId: ours.id }
		});
		expect(linked.status).toBe(201);
		expect(linked.body.chapter.partId).toBe(ours.id);

		for (const partId of [theirs.id, '00000000-0000-4000-8000-000000000000']) {
			const refused = await editor().api(chaptersPath(id), {
				method: 'POST',
				json: { startFrame: 900, title: 'Wrong part', partId }
			});
			expect(refused.status).toBe(400);
			expect(refused.body.issues.partId[0]).toContain("isn't in this channel's catalogue");
			const relinked = await editor().api(`${chaptersPath(id)}/${linked.body.chapter.id}`, {
				method: 'PATCH',
				json: { version: linked.body.chapter.version, partId }
			});
			expect(relinked.status).toBe(400);
		}
		// Nothing was saved by the refusals.
		expect(
			await sql(`SELECT title, part_id, version FROM chapter WHERE episode_id = $1`, [id])
		).toEqual([{ title: 'Cold open', part_id: ours.id, version: 1 }]);

		// The database holds the link too: a part that is gone clears it (ON DELETE SET NULL).
		const [spare] = await sql(
			`INSERT INTO part (channel_id, sku, brand, name, category, price_cents, currency, store_url)
			 VALUES ($1, $2, 'Kingbolt Suspension', 'Chapter link test part', 'Test', 100, 'USD', 'https://shop.torquehaven.test/p/chapter-link') RETURNING id`,
			[torquehavenId, `CHAPTER-LINK-${Date.now()}`]
		);
		const moved = await editor().api(`${chaptersPath(id)}/${linked.body.chapter.id}`, {
			method: 'PATCH',
			json: { version: 1, partId: spare.id }
		});
		expect(moved.status).toBe(200);
		await sql(`DELETE FROM part WHERE id = $1`, [spare.id]);
		expect(await sql(`SELECT title, part_id FROM chapter WHERE episode_id = $1`, [id])).toEqual([
			{ title: 'Cold open', part_id: null }
		]);
		await expect(
			sql(`UPDATE chapter SET part_id = gen_random_uuid() WHERE episode_id = $1`, [id])
		).rejects.toThrow(/chapter_part_fk/);
	});

	test('a start typed as a clock time reads back as that second in the description text', async () => {
		const { id } = await newEpisode({ cut: 24576 });
		const [, late] = await addChapters(id, [
			{ start: '0:00', title: 'Cold open' },
			{ start: '11:30', title: 'Road test' },
			{ start: '12:50', title: 'What it cost' }
		]);
		// The nearest frame to 690 s, 20679, starts at 689.993 s and would paste as 11:29;
		// the first frame at or after it, ⌈690 × 30000/1001⌉ = 20680, starts at 690.023 s.
		expect(late.startFrame).toBe(20680);
		const text = await (await editor().request(`${chaptersPath(id)}?format=txt`)).text();
		expect(text).toBe('0:00 Cold open\n11:30 Road test\n12:50 What it cost\n');
	});

	test('a move past a neighbour reorders the list', async () => {
		const { id } = await newEpisode({ cut: 20000 });
		const [a, b, c] = await addChapters(id, [
			{ startFrame: 0, title: 'Cold open' },
			{ startFrame: 3000, title: 'Lift' },
			{ startFrame: 6000, title: 'Lower' }
		]);
		const moved = await editor().api(`${chaptersPath(id)}/${b.id}`, {
			method: 'PATCH',
			json: { version: b.version, startFrame: 9000 }
		});
		expect(moved.body.state.chapters.map((chapter: { id: string }) => chapter.id)).toEqual([
			a.id,
			c.id,
			b.id
		]);
	});

	test('rule violations come back per chapter, in plain words, with every change', async () => {
		// 25 fps, so every time in a message is a whole number of milliseconds: the cut is 1800 frames = 1:12.
		const { id } = await newEpisode({ rate: '25', cut: 1800 });
		const answer = await editor().api(chaptersPath(id), {
			method: 'POST',
			json: { start: '0:05', title: 'Cold open' }
		});
		// One chapter: the list needs three, and this one doesn't start at 0:00 (common practice).
		expect(answer.body.state.problems).toEqual([
			{
				chapterId: null,
				field: 'list',
				message: 'A chapter list needs at least 3 chapters; this one has 1.'
			},
			{
				chapterId: answer.body.chapter.id,
				field: 'start',
				message: 'Chapter 1 “Cold open” starts at 0:05; the first chapter has to start at 0:00.'
			}
		]);
		const [short, blank, long, late] = await addChapters(id, [
			{ start: '0:10', title: 'Jack up the axle' },
			{ start: '0:30', title: '   ' },
			{ start: '0:45', title: 'x'.repeat(101) },
			{ start: '1:30', title: 'After the end' }
		]);
		const state = (await visitors.camera!.api(chaptersPath(id))).body;
		const byChapter = (chapterId: string) =>
			state.problems
				.filter((problem: { chapterId: string }) => problem.chapterId === chapterId)
				.map((problem: { message: string }) => problem.message);
		// The first chapter (0:05–0:10) is 5 s, short of the 10 s minimum.
		expect(byChapter(answer.body.chapter.id)).toContain(
			'Chapter 1 “Cold open” is 5 s long; chapters need at least 10 s.'
		);
		expect(byChapter(short.id)).toEqual([]);
		expect(byChapter(blank.id)).toEqual([
			'Chapter 3 has no title; give it a few words the viewer will see.'
		]);
		expect(byChapter(long.id)).toEqual([
			`Chapter 4 “${'x'.repeat(39)}…” has a 101-character title; keep it to 100 characters or fewer.`
		]);
		expect(byChapter(late.id)).toEqual([
			'Chapter 5 “After the end” starts at 1:30, at or after the end of the cut (1:12); move it earlier or remove it.'
		]);
	});

	test('a change naming a stale version answers 409 with the current row and changes nothing', async () => {
		const { id } = await newEpisode({ cut: 20000 });
		const [chapter] = await addChapters(id, [{ startFrame: 0, title: 'Cold open' }]);
		const first = await editor().api(`${chaptersPath(id)}/${chapter.id}`, {
			method: 'PATCH',
			json: { version: chapter.version, title: 'Cold open, take two' }
		});
		expect(first.status).toBe(200);
		const second = await visitors.producer!.api(`${chaptersPath(id)}/${chapter.id}`, {
			method: 'PATCH',
			json: { version: chapter.version, title: 'Producer’s title' }
		});
		expect(second.status).toBe(409);
		expect(second.body.current).toMatchObject({
			id: chapter.id,
			title: 'Cold open, take two',
			version: chapter.version + 1
		});
		expect(second.body.state.chapters).toHaveLength(1);
		const staleDelete = await visitors.producer!.api(
			`${chaptersPath(id)}/${chapter.id}?version=${chapter.version}`,
			{ method: 'DELETE' }
		);
		expect(staleDelete.status).toBe(409);
		expect(
			(await sql(`SELECT title, version FROM chapter WHERE id = $1`, [chapter.id]))[0]
		).toEqual({ title: 'Cold open, take two', version: 2 });
	});

	test('bad shapes are 400s: no start, both starts, a negative frame, a link that is not a web address', async () => {
		const { id } = await newEpisode({ cut: 20000 });
		for (const body of [
			{ title: 'No start' },
			{ start: '0:00', startFrame: 0, title: 'Both' },
			{ startFrame: -1, title: 'Negative' },
			{ startFrame: 0, title: 'Link', url: 'javascript:alert(1)' },
			{ startFrame: 0, title: 'Extra', colour: 'red' }
		]) {
			const answer = await editor().api(chaptersPath(id), { method: 'POST', json: body });
			expect(answer.status, JSON.stringify(body)).toBe(400);
		}
		const typo = await editor().api(chaptersPath(id), {
			method: 'POST',
			json: { start: '1:75', title: 'Typo' }
		});
		expect(typo.status).toBe(400);
		expect(typo.body.issues.start[0]).toContain('seconds go from 00 to 59');
		expect(await sql(`SELECT id FROM chapter WHERE episode_id = $1`, [id])).toEqual([]);
	});

	test('a made-up episode or chapter id is a 404', async () => {
		expect((await editor().api('/api/episodes/not-a-uuid/chapters')).status).toBe(404);
		expect(
			(await editor().api('/api/episodes/00000000-0000-4000-8000-000000000000/chapters')).status
		).toBe(404);
		const { id } = await newEpisode({ cut: 20000 });
		expect(
			(
				await editor().api(`${chaptersPath(id)}/00000000-0000-4000-8000-000000000000`, {
					method: 'PATCH',
					json: { version: 1, title: 'x' }
				})
			).status
		).toBe(404);
	});

	test('chapterProblemsFor (for the stage gates): null without chapters, the rule messages, then []', async () => {
		const executor = new Kysely<Database>({
			dialect: new PostgresDialect({
				pool: new pg.Pool({ connectionString: inject('databaseUrl'), max: 1 })
			}),
			plugins: [new CamelCasePlugin()]
		});
		try {
			const { id } = await newEpisode({ cut: 20000 });
			expect(await chapterProblemsFor(torquehavenId, id, executor)).toBeNull();
			await addChapters(id, [{ startFrame: 0, title: 'Cold open' }]);
			expect(await chapterProblemsFor(torquehavenId, id, executor)).toEqual([
				'A chapter list needs at least 3 chapters; this one has 1.'
			]);
			await addChapters(id, [
				{ startFrame: 3000, title: 'Lift' },
				{ startFrame: 6000, title: 'Lower' }
			]);
			expect(await chapterProblemsFor(torquehavenId, id, executor)).toEqual([]);
			const [dunewagon] = await sql(`SELECT id FROM channel WHERE name = 'Dune Wagon Weekly'`);
			await expect(chapterProblemsFor(dunewagon.id, id, executor)).rejects.toMatchObject({
				status: 404
			});
		} finally {
			await executor.destroy();
		}
	});
});

/** Titles that stress every format: commas, quotes, = ; # \, line breaks, markup and non-Latin letters. */
const TRICKY = [
	{ title: 'Cold open, then "the plan"', oneLine: 'Cold open, then "the plan"' },
	{
		title: 'Torque = 95 ft·lbf; step #3 \\ both sides',
		oneLine: 'Torque = 95 ft·lbf; step #3 \\ both sides'
	},
	{
		title: 'Bleed the brakes\nthen check the lines',
		oneLine: 'Bleed the brakes then check the lines'
	},
	{
		title: "Rico's <b>bold</b> & --> shackle flip",
		oneLine: "Rico's <b>bold</b> & --> shackle flip"
	},
	{ title: 'リフトアップ完了', oneLine: 'リフトアップ完了' },
	{ title: 'Подвеска: проверка, «готово»', oneLine: 'Подвеска: проверка, «готово»' },
	{ title: 'Ανάρτηση; τέλος', oneLine: 'Ανάρτηση; τέλος' }
];
/** Starts at 29.97 that fall between milliseconds (one frame = 33.366… ms). */
const TRICKY_STARTS = [0, 377, 1800, 5399, 9001, 17982, 20000];
const TRICKY_CUT = 30000;
const PART_LINK = 'https://shop.torquehaven.test/p/kbs-cs-150?ref=chapters';

describe('exports over HTTP', () => {
	let episode: { id: string; slug: string };
	const times = TRICKY_STARTS.map((start, index) => ({
		start: milliseconds2997(start),
		end: milliseconds2997(TRICKY_STARTS[index + 1] ?? TRICKY_CUT)
	}));
	const download = (format: string, as = editor()) =>
		as.request(`${chaptersPath(episode.id)}?format=${format}`);

	beforeAll(async () => {
		episode = await newEpisode({ cut: TRICKY_CUT });
		// Created through the API in shuffled order, so the titles cross HTTP both ways.
		const order = [3, 0, 6, 1, 5, 2, 4];
		await addChapters(
			episode.id,
			order.map((index) => ({
				startFrame: TRICKY_STARTS[index],
				title: TRICKY[index].title,
				...(index === 1 ? { url: PART_LINK } : {})
			}))
		);
	});

	async function expectDownload(
		format: string,
		contentType: string,
		extension: string
	): Promise<string> {
		const response = await download(format);
		expect(response.status).toBe(200);
		expect(response.headers.get('content-type')).toBe(contentType);
		// RFC 6266: an attachment with the episode's slug as the file name.
		expect(response.headers.get('content-disposition')).toBe(
			`attachment; filename="${episode.slug}-chapters.${extension}"`
		);
		expect(response.headers.get('server-timing')).toMatch(/total;dur=\d/);
		return response.text();
	}

	test('txt: description lines `M:SS Title` from 0:00, one line per chapter', async () => {
		const body = await expectDownload('txt', 'text/plain; charset=utf-8', 'txt');
		const lines = body
			.trimEnd()
			.split('\n')
			.map((line) => /^(\d+):(\d{2}) (.+)$/.exec(line)!);
		expect(lines.every(Boolean)).toBe(true);
		// Whole seconds, cut off (a timestamp never lands after its moment); common practice for descriptions.
		expect(lines.map((match) => Number(match[1]) * 60 + Number(match[2]))).toEqual(
			times.map(({ start }) => Math.floor(start / 1000))
		);
		expect(lines.map((match) => match[3])).toEqual(TRICKY.map(({ oneLine }) => oneLine));
	});

	test('vtt: webvtt-parser reads it with zero errors, cues back to back, titles as text', async () => {
		const body = await expectDownload('vtt', 'text/vtt; charset=utf-8', 'vtt');
		const parsed = new WebVTTParser(htmlEntities).parse(body, 'chapters');
		expect(parsed.errors).toEqual([]);
		expect(
			parsed.cues.map((cue) => [Math.round(cue.startTime * 1000), Math.round(cue.endTime * 1000)])
		).toEqual(times.map(({ start, end }) => [start, end]));
		expect(parsed.cues.map((cue) => cueText(cue.tree))).toEqual(
			TRICKY.map(({ oneLine }) => oneLine)
		);
	});

	test('ffmetadata: ffmeta reads TIMEBASE=1/1000, START, END and each title with its line break', async () => {
		const body = await expectDownload('ffmetadata', 'text/plain; charset=utf-8', 'ffmeta');
		expect(body.startsWith(';FFMETADATA1\n')).toBe(true);
		const parsed = parseFfmetadata(body);
		expect(parsed.chapters.map((chapter) => chapter.TIMEBASE)).toEqual(TRICKY.map(() => '1/1000'));
		expect(parsed.chapters.map((chapter) => [Number(chapter.START), Number(chapter.END)])).toEqual(
			times.map(({ start, end }) => [start, end])
		);
		expect(parsed.chapters.map((chapter) => chapter.metadata.title)).toEqual(
			TRICKY.map(({ title }) => title)
		);
	});

	test.skipIf(!existsSync('/usr/bin/ffprobe'))(
		'ffmetadata: ffprobe reads the same chapters',
		async () => {
			const folder = mkdtempSync(join(tmpdir(), 'wrenchroll-edit-'));
			try {
				const file = join(folder, 'chapters.ffmeta');
				writeFileSync(file, await (await download('ffmetadata')).text());
				const probed = JSON.parse(
					execFileSync(
						'/usr/bin/ffprobe',
						['-v', 'error', '-f', 'ffmetadata', '-i', file, '-show_chapters', '-of', 'json'],
						{ encoding: 'utf8' }
					)
				) as {
					chapters: { start: number; end: number; tags?: { title?: string } }[];
				};
				expect(probed.chapters.map((chapter) => [chapter.start, chapter.end])).toEqual(
					times.map(({ start, end }) => [start, end])
				);
				expect(probed.chapters.map((chapter) => chapter.tags?.title)).toEqual(
					TRICKY.map(({ title }) => title)
				);
			} finally {
				rmSync(folder, { recursive: true, force: true });
			}
		}
	);

	test('json: the Podcasting 2.0 field rules hold, with the part link as url', async () => {
		const body = await expectDownload('json', 'application/json+chapters', 'json');
		const document = JSON.parse(body) as { version: unknown; chapters: Record<string, unknown>[] };
		// jsonChapters.md v1.2: version string; chapters array; startTime a number (seconds), ascending;
		// title, url strings; endTime a number not before startTime.
		expect(document.version).toBe('1.2.0');
		expect(Array.isArray(document.chapters)).toBe(true);
		let previous = -Infinity;
		for (const chapter of document.chapters) {
			expect(typeof chapter.startTime).toBe('number');
			expect(chapter.startTime as number).toBeGreaterThanOrEqual(previous);
			previous = chapter.startTime as number;
			expect(typeof chapter.title).toBe('string');
			expect(chapter.endTime as number).toBeGreaterThanOrEqual(chapter.startTime as number);
			if ('url' in chapter) expect(typeof chapter.url).toBe('string');
		}
		expect(document.chapters.map((chapter) => chapter.startTime)).toEqual(
			times.map(({ start }) => start / 1000)
		);
		expect(document.chapters.map((chapter) => chapter.title)).toEqual(
			TRICKY.map(({ title }) => title)
		);
		expect(document.chapters.map((chapter) => chapter.url ?? null)).toEqual(
			TRICKY.map((_, index) => (index === 1 ? PART_LINK : null))
		);
	});

	test('csv: papaparse reads the header, drop-frame timecodes, seconds and every title', async () => {
		const body = await expectDownload('csv', 'text/csv; charset=utf-8', 'csv');
		const parsed = Papa.parse<Record<string, string>>(body, { header: true, skipEmptyLines: true });
		expect(parsed.errors).toEqual([]);
		expect(parsed.meta.fields).toEqual(['start_timecode', 'start_seconds', 'end_seconds', 'title']);
		expect(parsed.data.map((row) => row.start_timecode)).toEqual(
			TRICKY_STARTS.map((frame) => smpte(frame, [30000, 1001], true).toString())
		);
		expect(parsed.data.map((row) => Number(row.start_seconds))).toEqual(
			times.map(({ start }) => start / 1000)
		);
		expect(parsed.data.map((row) => Number(row.end_seconds))).toEqual(
			times.map(({ end }) => end / 1000)
		);
		expect(parsed.data.map((row) => row.title)).toEqual(TRICKY.map(({ title }) => title));
	});

	test('an unknown format is a 400 naming the five', async () => {
		const answer = await editor().api(`${chaptersPath(episode.id)}?format=pdf`);
		expect(answer.status).toBe(400);
		expect(answer.body.error).toContain('txt, vtt, ffmetadata, json or csv');
	});

	test('every crew role may download; a signed-out visitor gets 401', async () => {
		for (const role of ['producer', 'host', 'camera', 'merch'] as const) {
			expect((await download('txt', visitors[role]!)).status, role).toBe(200);
		}
		expect((await new Visitor().request(`${chaptersPath(episode.id)}?format=txt`)).status).toBe(
			401
		);
	});
});

describe('exports refuse a list that breaks the rules', () => {
	test('422 with the problems, in every format, for too few chapters', async () => {
		const { id } = await newEpisode({ cut: 20000 });
		await addChapters(id, [
			{ startFrame: 0, title: 'Cold open' },
			{ startFrame: 3000, title: 'Lift' }
		]);
		for (const format of ['txt', 'vtt', 'ffmetadata', 'json', 'csv']) {
			const answer = await editor().api(`${chaptersPath(id)}?format=${format}`);
			expect(answer.status, format).toBe(422);
			expect(answer.headers.get('content-type')).toContain('application/json');
			expect(answer.body.problems).toEqual([
				{
					chapterId: null,
					field: 'list',
					message: 'A chapter list needs at least 3 chapters; this one has 2.'
				}
			]);
		}
	});

	test('422 when the cut has no length, and when a chapter is too short', async () => {
		const noCut = await newEpisode();
		await addChapters(noCut.id, [
			{ startFrame: 0, title: 'Cold open' },
			{ startFrame: 3000, title: 'Lift' },
			{ startFrame: 6000, title: 'Lower' }
		]);
		const answer = await editor().api(`${chaptersPath(noCut.id)}?format=vtt`);
		expect(answer.status).toBe(422);
		expect(answer.body.problems[0].message).toContain('The cut has no length yet');

		const short = await newEpisode({ cut: 20000 });
		const [, lift] = await addChapters(short.id, [
			{ startFrame: 0, title: 'Cold open' },
			{ startFrame: 3000, title: 'Lift' },
			// 299 frames at 29.97 = 9.976 s, one frame short of 10 s (common practice minimum).
			{ startFrame: 3299, title: 'Lower' }
		]);
		const tooShort = await editor().api(`${chaptersPath(short.id)}?format=csv`);
		expect(tooShort.status).toBe(422);
		expect(tooShort.body.problems).toEqual([
			{
				chapterId: lift.id,
				field: 'start',
				message: 'Chapter 2 “Lift” is 9.9 s long; chapters need at least 10 s.'
			}
		]);
	});
});

describe('what the stage has fixed', () => {
	test('at picture lock the cut length is refused (409, in words) but chapters still change', async () => {
		const { id } = await newEpisode({ cut: 24576, stage: 'locked' });
		const state = (await editor().api(chaptersPath(id))).body;
		expect(state.locks.cut).toContain('picture is locked');
		expect(state.locks.chapters).toBeNull();
		const cut = await editor().api(`/api/episodes/${id}/cut`, {
			method: 'PATCH',
			json: { duration: '00:14:00;00' }
		});
		expect(cut.status).toBe(409);
		expect(cut.body.error).toContain('move it back to Edit');
		expect(
			(await sql(`SELECT cut_duration_frames FROM episode WHERE id = $1`, [id]))[0]
				.cut_duration_frames
		).toBe(24576);
		const [chapter] = await addChapters(id, [{ startFrame: 0, title: 'Cold open' }]);
		expect(chapter.title).toBe('Cold open');
	});

	test('once published, chapters and the cut are refused for the editor and the producer alike, and nothing changes', async () => {
		const { id } = await newEpisode({ cut: 24576 });
		const [first] = await addChapters(id, [{ startFrame: 0, title: 'Cold open' }]);
		await sql(`UPDATE episode SET stage = 'published' WHERE id = $1`, [id]);
		for (const who of [editor(), visitors.producer!]) {
			const added = await who.api(chaptersPath(id), {
				method: 'POST',
				json: { startFrame: 900, title: 'Late addition' }
			});
			expect(added.status).toBe(409);
			expect(added.body.error).toContain('published');
			expect(
				(
					await who.api(`${chaptersPath(id)}/${first.id}`, {
						method: 'PATCH',
						json: { version: first.version, title: 'Renamed' }
					})
				).status
			).toBe(409);
			expect(
				(
					await who.api(`${chaptersPath(id)}/${first.id}?version=${first.version}`, {
						method: 'DELETE'
					})
				).status
			).toBe(409);
			expect(
				(
					await who.api(`/api/episodes/${id}/cut`, {
						method: 'PATCH',
						json: { duration: '00:14:00;00' }
					})
				).status
			).toBe(409);
		}
		expect(await sql(`SELECT title, version FROM chapter WHERE episode_id = $1`, [id])).toEqual([
			{ title: 'Cold open', version: 1 }
		]);
		// Moved back to picture lock, the chapters open again.
		await sql(`UPDATE episode SET stage = 'locked' WHERE id = $1`, [id]);
		expect(
			(
				await editor().api(`${chaptersPath(id)}/${first.id}`, {
					method: 'PATCH',
					json: { version: first.version, title: 'Renamed' }
				})
			).status
		).toBe(200);
	});

	test('without JavaScript a published episode’s chapter form answers 409 with the reason', async () => {
		const { id } = await newEpisode({ cut: 24576, stage: 'published' });
		const answer = await editor().action(`/episodes/${id}/edit?/addChapter`, {
			start: '0:00',
			title: 'Cold open'
		});
		expect(answer.status).toBe(409);
		expect(answer.data.errors.form[0]).toContain('published');
		expect(await sql(`SELECT 1 FROM chapter WHERE episode_id = $1`, [id])).toEqual([]);
		// The page says why up front and offers no chapter form.
		const page = await (await editor().request(`/episodes/${id}/edit`)).text();
		expect(page).toContain('This episode is published');
		expect(page).not.toContain('action="?/addChapter"');
	});
});

describe('who may change the edit', () => {
	test('host, camera operator and merch team read but get 403 on every write, and nothing changes', async () => {
		const { id } = await newEpisode({ cut: 20000 });
		const [chapter] = await addChapters(id, [{ startFrame: 0, title: 'Cold open' }]);
		for (const role of ['host', 'camera', 'merch'] as const) {
			const visitor = visitors[role]!;
			expect((await visitor.api(chaptersPath(id))).status, role).toBe(200);
			expect(
				(
					await visitor.api(chaptersPath(id), {
						method: 'POST',
						json: { startFrame: 900, title: 'Mine' }
					})
				).status,
				role
			).toBe(403);
			expect(
				(
					await visitor.api(`${chaptersPath(id)}/${chapter.id}`, {
						method: 'PATCH',
						json: { version: 1, title: 'Mine' }
					})
				).status,
				role
			).toBe(403);
			expect(
				(await visitor.api(`${chaptersPath(id)}/${chapter.id}`, { method: 'DELETE' })).status,
				role
			).toBe(403);
			expect(
				(
					await visitor.api(`/api/episodes/${id}/cut`, {
						method: 'PATCH',
						json: { duration: '1:00' }
					})
				).status,
				role
			).toBe(403);
		}
		expect(await sql(`SELECT title, version FROM chapter WHERE episode_id = $1`, [id])).toEqual([
			{ title: 'Cold open', version: 1 }
		]);
		expect(
			(await sql(`SELECT cut_duration_frames FROM episode WHERE id = $1`, [id]))[0]
				.cut_duration_frames
		).toBe(20000);
	});

	test('signed out: 401 for reads and writes', async () => {
		const { id } = await newEpisode({ cut: 20000 });
		const stranger = new Visitor();
		expect((await stranger.api(chaptersPath(id))).status).toBe(401);
		expect(
			(
				await stranger.api(chaptersPath(id), {
					method: 'POST',
					json: { startFrame: 0, title: 'x' }
				})
			).status
		).toBe(401);
		expect(
			(
				await stranger.api(`/api/episodes/${id}/cut`, {
					method: 'PATCH',
					json: { duration: '1:00' }
				})
			).status
		).toBe(401);
	});

	test('a producer of another channel gets 404 for this channel’s episode, and changes nothing', async () => {
		const { id } = await newEpisode({ cut: 20000 });
		const [chapter] = await addChapters(id, [{ startFrame: 0, title: 'Cold open' }]);
		const other = visitors.other!;
		expect((await other.api(chaptersPath(id))).status).toBe(404);
		expect((await other.api(`${chaptersPath(id)}?format=txt`)).status).toBe(404);
		expect(
			(
				await other.api(chaptersPath(id), {
					method: 'POST',
					json: { startFrame: 900, title: 'Theirs' }
				})
			).status
		).toBe(404);
		expect(
			(
				await other.api(`${chaptersPath(id)}/${chapter.id}`, {
					method: 'PATCH',
					json: { version: 1, title: 'Theirs' }
				})
			).status
		).toBe(404);
		expect(
			(await other.api(`${chaptersPath(id)}/${chapter.id}`, { method: 'DELETE' })).status
		).toBe(404);
		expect(
			(await other.api(`/api/episodes/${id}/cut`, { method: 'PATCH', json: { duration: '1:00' } }))
				.status
		).toBe(404);
		expect((await other.request(`/episodes/${id}/edit`)).status).toBe(404);
		expect(await sql(`SELECT title FROM chapter WHERE episode_id = $1`, [id])).toEqual([
			{ title: 'Cold open' }
		]);
	});

	test('the shared editor sees only the channel they work in: Dune Wagon’s episode is 404 from Torquehaven', async () => {
		expect((await editor().api(chaptersPath(otherChannelEpisodeId))).status).toBe(404);
		const inDuneWagon = await signedIn(demo.editor);
		const me = await inDuneWagon.api('/api/me');
		const dunewagon = me.body.channels.find(
			(channel: { name: string }) => channel.name === 'Dune Wagon Weekly'
		);
		await inDuneWagon.request('/channel?/switch', {
			method: 'POST',
			form: { channelId: dunewagon.id }
		});
		expect((await inDuneWagon.api(chaptersPath(otherChannelEpisodeId))).status).toBe(200);
	});
});

describe('the edit page', () => {
	test('the editor gets the timeline with the forms; the host gets it read-only', async () => {
		const [episode] = await sql(
			`SELECT id, title FROM episode WHERE slug = 'mule-rear-block-lift'`
		);
		const forEditor = await editor().request(`/episodes/${episode.id}/edit`);
		expect(forEditor.status).toBe(200);
		const html = await forEditor.text();
		expect(html).toContain('3-inch rear block lift on Project Mule');
		expect(html).toContain('role="slider"');
		expect(html).toContain('Add chapter');
		const forHost = await (await visitors.host!.request(`/episodes/${episode.id}/edit`)).text();
		expect(forHost).toContain('role="slider"');
		expect(forHost).not.toContain('Add chapter');
		expect((await new Visitor().request(`/episodes/${episode.id}/edit`)).status).toBe(303);
	});

	test('without JavaScript the forms post to actions that make the same changes', async () => {
		const { id } = await newEpisode();
		const cut = await editor().action(`/episodes/${id}/edit?/setCut`, { duration: '00:10:00;00' });
		expect(cut.type).toBe('redirect');
		// 00:10:00;00 at 29.97 DF = 17982 frames (SMPTE ST 12-1; tests/REFERENCES.md, "Timecode").
		expect(
			(await sql(`SELECT cut_duration_frames FROM episode WHERE id = $1`, [id]))[0]
				.cut_duration_frames
		).toBe(17982);
		expect(
			(
				await editor().action(`/episodes/${id}/edit?/addChapter`, {
					start: '0:00',
					title: 'Cold open'
				})
			).type
		).toBe('redirect');
		const [chapter] = await sql(`SELECT id, version FROM chapter WHERE episode_id = $1`, [id]);
		expect(
			(
				await editor().action(`/episodes/${id}/edit?/saveChapter`, {
					chapterId: chapter.id,
					version: String(chapter.version),
					start: '00:00:00;00',
					title: 'Cold open, again'
				})
			).type
		).toBe('redirect');
		expect((await sql(`SELECT title FROM chapter WHERE id = $1`, [chapter.id]))[0].title).toBe(
			'Cold open, again'
		);
		const bad = await editor().action(`/episodes/${id}/edit?/addChapter`, {
			start: '1:75',
			title: 'Typo'
		});
		expect(bad.type).toBe('failure');
		expect(bad.status).toBe(400);
		expect(
			(
				await editor().action(`/episodes/${id}/edit?/removeChapter`, {
					chapterId: chapter.id,
					version: '2'
				})
			).type
		).toBe('redirect');
		expect(await sql(`SELECT id FROM chapter WHERE episode_id = $1`, [id])).toEqual([]);
		const asHost = await visitors.host!.request(`/episodes/${id}/edit?/addChapter`, {
			method: 'POST',
			form: { start: '0:00', title: 'Host' },
			headers: { accept: 'application/json', 'x-sveltekit-action': 'true' }
		});
		expect(asHost.status).toBe(403);
		expect(await sql(`SELECT id FROM chapter WHERE episode_id = $1`, [id])).toEqual([]);
	});
});

afterAll(async () => {
	await sql(`DELETE FROM episode WHERE slug LIKE 'edit-test-%'`);
});
