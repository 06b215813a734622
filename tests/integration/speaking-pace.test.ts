/**
 * A host's speaking pace over HTTP against the built server: timed from a reading of the sample
 * paragraph aloud (the Pace page's `record` action), refused with a field message when the time
 * makes no speaking pace, never taken from a segment's length in the cut, and used by the rundown,
 * whose spoken time is compared with the planned time of its spoken segments only.
 *
 * Sources: 150 wpm default for presented speech (common practice; Lucas, The Art of Public
 * Speaking, 125–150 wpm; from memory); the sample paragraph has 100 spoken words
 * (tests/unit/pace-sample.test.ts). The 80–260 wpm range is our own (tests/REFERENCES.md,
 * "Narration pace"). Numbers read aloud: "Numbers read aloud".
 */
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { demo, signedIn, sql, type Visitor } from '../helpers/http';

let producer: Visitor;
let host: Visitor;
let camera: Visitor;
let hostId = '';
let producerId = '';
let cameraId = '';

beforeAll(async () => {
	[producer, host, camera] = await Promise.all([
		signedIn(demo.producer),
		signedIn(demo.host),
		signedIn(demo.camera)
	]);
	const ids = await sql<{ email: string; id: string }>(
		`SELECT email, id FROM person WHERE email = ANY($1)`,
		[[demo.host, demo.producer, demo.camera]]
	);
	hostId = ids.find((row) => row.email === demo.host)!.id;
	producerId = ids.find((row) => row.email === demo.producer)!.id;
	cameraId = ids.find((row) => row.email === demo.camera)!.id;
	await sql(`DELETE FROM speaking_pace`);
});

// Other test files expect the demo host at the default pace.
afterAll(async () => {
	await sql(`DELETE FROM speaking_pace`);
});

async function episodeWithSegments(title: string) {
	const episode = (
		await producer.api('/api/episodes', {
			method: 'POST',
			json: {
				title: `${title} ${Date.now()}`,
				targetRuntimeSeconds: '10:00',
				frameRate: '29.97',
				assignments: { host: hostId }
			}
		})
	).body.episode;
	const addSegment = async (kind: string, segmentTitle: string, plannedSeconds: string) =>
		(
			await producer.api(`/api/episodes/${episode.id}/segments`, {
				method: 'POST',
				json: { kind, title: segmentTitle, plannedSeconds }
			})
		).body.segment;
	const talk = await addSegment('overview', 'What we do today', '1:00');
	const work = await addSegment('install-step', 'Swap the blocks', '8:00');
	return { episode, talk, work };
}

const pace = async (episodeId: string) =>
	(await host.api(`/api/episodes/${episodeId}/segments`)).body;

describe('the pace is not a segment’s length in the cut', () => {
	test('400 words over 30 s of cut leaves the default pace, not "260, calibrated"', async () => {
		const { episode, talk } = await episodeWithSegments('Cut is not pace');
		const body = Array.from({ length: 400 }, () => 'bolt').join(' ');
		const saved = await host.api(`/api/segments/${talk.id}/script`, {
			method: 'PUT',
			json: { body, version: talk.script.version }
		});
		expect(saved.status).toBe(200);
		// 30 s of cut at 29.97: 899 frames is 29.997 s (SMPTE ST 12-1 real time, tests/REFERENCES.md).
		await sql(`UPDATE segment SET recorded_frames = 899 WHERE id = $1`, [talk.id]);
		// Old rule: 400 words ÷ 0.5 min = 800 wpm, clamped to 260 and labelled calibrated.
		const rundown = await pace(episode.id);
		expect(rundown.pace).toMatchObject({
			wordsPerMinute: 150,
			calibrated: false,
			basis: 'default'
		});
	});
});

describe('timing a reading aloud (the Pace page)', () => {
	test('a host saves their own reading; the rundown uses it and says so', async () => {
		// 100 words in 37.5 s = 100 ÷ 0.625 min = 160 wpm (hand-worked).
		const saved = await host.action('/pace?/record', { personId: hostId, seconds: '37.5' });
		expect(saved.type).toBe('success');
		expect(saved.data.saved.wordsPerMinute).toBe(160);
		const rows = await sql(
			`SELECT words, milliseconds, recorded_by FROM speaking_pace WHERE person_id = $1`,
			[hostId]
		);
		expect(rows).toEqual([{ words: 100, milliseconds: 37500, recorded_by: hostId }]);

		const { episode } = await episodeWithSegments('Reading used');
		const rundown = await pace(episode.id);
		expect(rundown.pace).toMatchObject({ wordsPerMinute: 160, calibrated: true, basis: 'reading' });
		const html = await (
			await host.request(`/episodes/${episode.id}/rundown`, { headers: { accept: 'text/html' } })
		).text();
		expect(html).toContain('from a timed reading aloud');
	});

	test('bad input answers 400 with a message on its field, and the saved pace stays', async () => {
		await host.action('/pace?/record', { personId: hostId, seconds: '40' }); // 150 wpm
		const cases: Array<[Record<string, string>, string, RegExp]> = [
			[{ personId: hostId, seconds: '' }, 'seconds', /how long the reading took/],
			[{ personId: hostId, seconds: 'forty' }, 'seconds', /how long the reading took/],
			[{ personId: hostId, seconds: '0.2' }, 'seconds', /under a second/],
			[{ personId: hostId, seconds: '900' }, 'seconds', /over ten minutes/],
			[{ personId: 'not-a-person', seconds: '40' }, 'personId', /Pick the host/]
		];
		for (const [form, field, message] of cases) {
			const answer = await host.action('/pace?/record', form);
			expect(answer.status, JSON.stringify(form)).toBe(400);
			expect(answer.data.errors[field][0]).toMatch(message);
			expect(answer.data.values.seconds).toBe(form.seconds);
		}
		const rows = await sql(`SELECT milliseconds FROM speaking_pace WHERE person_id = $1`, [hostId]);
		expect(rows).toEqual([{ milliseconds: 40000 }]);
	});

	test('a time that makes no speaking pace is refused, not clamped: 100 words in 10 s', async () => {
		// Hand-worked: 100 ÷ (10/60) = 600 wpm, far above radio bulletins' 160–180 (Rodero 2012).
		const fast = await host.action('/pace?/record', { personId: hostId, seconds: '10' });
		expect(fast.status).toBe(400);
		expect(fast.data.errors.seconds[0]).toMatch(/600 words a minute: not a speaking pace/);
		// 100 words in 100 s = 60 wpm: a clock left running.
		const slow = await host.action('/pace?/record', { personId: hostId, seconds: '100' });
		expect(slow.status).toBe(400);
		expect(slow.data.errors.seconds[0]).toMatch(/60 words a minute: not a speaking pace/);
		const rows = await sql(`SELECT milliseconds FROM speaking_pace WHERE person_id = $1`, [hostId]);
		expect(rows).toEqual([{ milliseconds: 40000 }]);
	});

	test('a producer may time any host; a host only themselves; others not at all', async () => {
		const byProducer = await producer.action('/pace?/record', {
			personId: hostId,
			seconds: '42.9'
		});
		expect(byProducer.type).toBe('success');
		// 100 ÷ (42.9/60) = 139.86… → 140 wpm shown.
		expect(Math.round(byProducer.data.saved.wordsPerMinute)).toBe(140);

		const forAnother = await host.action('/pace?/record', {
			personId: producerId,
			seconds: '40'
		});
		expect(forAnother.status).toBe(403);
		expect(forAnother.data.errors.form[0]).toMatch(/Only a producer/);

		// The camera operator is no host: a producer cannot give them a pace either.
		const notAHost = await producer.action('/pace?/record', { personId: cameraId, seconds: '40' });
		expect(notAHost.status).toBe(404);
		expect(notAHost.data.errors.form[0]).toMatch(/host/);

		const cameraTries = await camera.action('/pace?/record', { personId: cameraId, seconds: '40' });
		expect(cameraTries.status).toBe(403);
		expect((await camera.request('/pace', { headers: { accept: 'text/html' } })).status).toBe(403);
	});
});

describe('spoken time is compared with the spoken segments’ plan', () => {
	test('a how-to episode: one minute of talk against its one planned minute, eight minutes of work apart', async () => {
		await sql(`DELETE FROM speaking_pace`);
		const { episode, talk } = await episodeWithSegments('Spoken against spoken');
		// 150 words at the 150 wpm default = 60 s, the talk segment's planned minute.
		const body = Array.from({ length: 150 }, () => 'spanner').join(' ');
		await host.api(`/api/segments/${talk.id}/script`, {
			method: 'PUT',
			json: { body, version: talk.script.version }
		});
		const rundown = await pace(episode.id);
		expect(rundown.totals).toMatchObject({
			spokenSeconds: 60,
			spokenSegments: 1,
			spokenPlannedSeconds: 60,
			wordlessSegments: 1,
			wordlessPlannedSeconds: 480
		});
		// The old page compared 1:00 of speech with the 10:00 runtime and always read "under".
		for (const page of ['script', 'rundown']) {
			const html = await (
				await host.request(`/episodes/${episode.id}/${page}`, {
					headers: { accept: 'text/html' }
				})
			).text();
			expect(html, page).toContain('data-runtime-state="on"');
			expect(html, page).toMatch(/Work without words: 1 segment, 8:00 planned/);
		}
	});
});
