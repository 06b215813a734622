/**
 * Cautions tied to their hazard (the lock gate, src/lib/gates.ts): a flagged segment's caution card
 * must be on screen inside that segment's in and out points on the edit timeline, for at least its
 * reading time; segment spans are typed like the other edit fields and checked on save.
 *
 * Frames at 29.97 drop-frame follow SMPTE ST 12-1 (tests/REFERENCES.md, "Timecode": 17982 frames
 * is 00:10:00;00; 30 s is label 00:00:30;00 = frame 900, since minute 0 drops no labels). Reading
 * time is characters ÷ 17 rounded up (common practice for subtitles, from memory;
 * tests/REFERENCES.md, "Reading speed").
 */
import { beforeAll, describe, expect, test } from 'vitest';
import { Visitor, demo, signedIn, sql } from '../helpers/http';
import { approvedCutFixture } from '../helpers/cut-review';

const STANDS =
	'Use rated jack stands on solid, level ground. Never work under a vehicle held up only by a jack.';

let producer: Visitor;
let editor: Visitor;
let channelId: string;
let sequence = 0;

async function inTorquehaven(visitor: Visitor) {
	await visitor.request('/channel?/switch', { method: 'POST', form: { channelId } });
	return visitor;
}

/** An episode in the edit stage with a 10-minute cut, three valid chapters and one flagged segment. */
async function flaggedEpisode(caution: { atFrame: number | null; durationFrames: number | null }) {
	const slug = `caution-span-${Date.now()}-${sequence++}`;
	const [episode] = await sql(
		`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate, stage, cut_duration_frames)
		 VALUES ($1, $2, $3, 600, '29.97', 'edit', 17982) RETURNING id`,
		[channelId, `Stands test ${slug}`, slug]
	);
	const [segment] = await sql(
		`INSERT INTO segment (episode_id, position, kind, title, hazards) VALUES ($1, 1, 'install-step', 'Jack it up', ARRAY['raised-vehicle']) RETURNING id, version`,
		[episode.id]
	);
	await sql(`INSERT INTO segment_script (segment_id, body) VALUES ($1, 'Chock the wheels.')`, [
		segment.id
	]);
	await sql(
		`INSERT INTO caution (segment_id, hazard, text, at_frame, duration_frames) VALUES ($1, 'raised-vehicle', $2, $3, $4)`,
		[segment.id, STANDS, caution.atFrame, caution.durationFrames]
	);
	for (const [start, title] of [
		['0:00', 'Cold open'],
		['3:00', 'Up on stands'],
		['6:00', 'Down and done']
	]) {
		const added = await editor.api(`/api/episodes/${episode.id}/chapters`, {
			method: 'POST',
			json: { start, title }
		});
		expect(added.status, JSON.stringify(added.body)).toBe(201);
	}
	// The cut review's own lock rules are tested in cut-review.test.ts: here v1 is approved.
	await approvedCutFixture(episode.id);
	return { episodeId: episode.id as string, segmentId: segment.id as string };
}

const lockReport = async (episodeId: string) =>
	(await producer.api(`/api/episodes/${episodeId}/stage`)).body as {
		next: string;
		reasons: { rule: string; subject: string; message: string; fixedBy: string }[];
	};

const segmentVersion = async (segmentId: string) =>
	(await sql(`SELECT version FROM segment WHERE id = $1`, [segmentId]))[0].version as number;

const cautionVersion = async (segmentId: string) =>
	(await sql(`SELECT version FROM caution WHERE segment_id = $1`, [segmentId]))[0]
		.version as number;

beforeAll(async () => {
	const [channel] = await sql(`SELECT id FROM channel WHERE name = 'Torquehaven Garage'`);
	channelId = channel.id;
	producer = await inTorquehaven(await signedIn(demo.producer));
	editor = await inTorquehaven(await signedIn(demo.editor));
});

describe('the lock gate ties each caution to its segment', () => {
	test('a stands caution in the end credits is refused, naming the segment; moved inside its span it passes', async () => {
		// The bug: at 00:09:26;xx (frame 17000), inside the cut but far from the stands work, 6 s long.
		const { episodeId, segmentId } = await flaggedEpisode({ atFrame: 17000, durationFrames: 180 });
		const placed = await editor.api(`/api/segments/${segmentId}/span`, {
			method: 'PATCH',
			json: { in: '0:30', out: '00:02:00;04', version: await segmentVersion(segmentId) }
		});
		expect(placed.status, JSON.stringify(placed.body)).toBe(200);
		// 30 s at 30000/1001 fps = 899.1 → frame 899 (nearest frame); 00:02:00;04 = frame 3600.
		expect(placed.body.span).toMatchObject({ inFrame: 899, outFrame: 3600 });

		const report = await lockReport(episodeId);
		expect(report.next).toBe('locked');
		expect(report.reasons).toHaveLength(1);
		expect(report.reasons[0]).toMatchObject({
			rule: 'caution-outside-segment',
			subject: 'Segment 1 “Jack it up”',
			fixedBy: 'editor'
		});
		expect(report.reasons[0].message).toContain('“Vehicle raised on stands” caution');
		expect(report.reasons[0].message).toContain('00:02:00;04'); // the segment's out point
		const refused = await producer.api(`/api/episodes/${episodeId}/stage`, {
			method: 'POST',
			json: { from: 'edit', to: 'locked' }
		});
		expect(refused.status).toBe(422);

		// The editor moves the card inside the segment, 6 s long: 96 characters ÷ 17 = 5.6 → 6 s.
		const moved = await editor.api(`/api/segments/${segmentId}/cautions/raised-vehicle`, {
			method: 'PATCH',
			json: { at: '0:40', seconds: 6, version: await cautionVersion(segmentId) }
		});
		expect(moved.status, JSON.stringify(moved.body)).toBe(200);
		expect(moved.body.caution).toMatchObject({ durationSeconds: 6, neededSeconds: 6 });
		expect((await lockReport(episodeId)).reasons).toEqual([]);
		const locked = await producer.api(`/api/episodes/${episodeId}/stage`, {
			method: 'POST',
			json: { from: 'edit', to: 'locked' }
		});
		expect(locked.status, JSON.stringify(locked.body)).toBe(200);
	});

	test('a caution shown too short to read is refused by the gate with the seconds it needs', async () => {
		// 60 frames = 2 s, inside the segment; left from before the check existed (written directly).
		const { episodeId, segmentId } = await flaggedEpisode({ atFrame: 1200, durationFrames: 60 });
		await sql(`UPDATE segment SET cut_in_frame = 900, cut_out_frame = 3600 WHERE id = $1`, [
			segmentId
		]);
		const report = await lockReport(episodeId);
		expect(report.reasons.map((reason) => reason.rule)).toEqual(['caution-too-short']);
		expect(report.reasons[0].message).toContain('on screen for 2 s');
		expect(report.reasons[0].message).toContain('96 characters need 6 s');
	});

	test('a flagged segment with no span is refused for its caution', async () => {
		const { episodeId } = await flaggedEpisode({ atFrame: 1200, durationFrames: 300 });
		const report = await lockReport(episodeId);
		expect(report.reasons).toMatchObject([
			{ rule: 'segment-span-missing', subject: 'Segment 1 “Jack it up”', fixedBy: 'editor' }
		]);
	});
});

describe('saving a time on screen', () => {
	test('a caution shown shorter than its words need is refused on its field with the seconds needed; nothing is lost', async () => {
		const { segmentId } = await flaggedEpisode({ atFrame: 1200, durationFrames: 300 });
		const answer = await editor.api(`/api/segments/${segmentId}/cautions/raised-vehicle`, {
			method: 'PATCH',
			json: { seconds: 2, version: await cautionVersion(segmentId) }
		});
		expect(answer.status).toBe(400);
		expect(answer.body.issues.seconds[0]).toContain('need 6 s');
		const [row] = await sql(`SELECT duration_frames FROM caution WHERE segment_id = $1`, [
			segmentId
		]);
		expect(row.duration_frames).toBe(300);
		// Not a number, or over a minute: the field says so.
		for (const seconds of ['soon', 61]) {
			const bad = await editor.api(`/api/segments/${segmentId}/cautions/raised-vehicle`, {
				method: 'PATCH',
				json: { seconds, version: await cautionVersion(segmentId) }
			});
			expect(bad.status).toBe(400);
			expect(bad.body.issues.seconds).toHaveLength(1);
		}
	});

	test('the host words a caution but does not set its time on screen', async () => {
		const { segmentId } = await flaggedEpisode({ atFrame: 1200, durationFrames: 300 });
		const host = await inTorquehaven(await signedIn(demo.host));
		const answer = await host.api(`/api/segments/${segmentId}/cautions/raised-vehicle`, {
			method: 'PATCH',
			json: { seconds: 9, version: await cautionVersion(segmentId) }
		});
		expect(answer.status).toBe(403);
	});
});

describe('segment in and out points', () => {
	const patch = async (segmentId: string, span: Record<string, unknown>, who = editor) =>
		who.api(`/api/segments/${segmentId}/span`, {
			method: 'PATCH',
			json: { version: await segmentVersion(segmentId), ...span }
		});

	test('in after out, out past the cut, a typing mistake or one end alone are 400s on their fields', async () => {
		const { segmentId } = await flaggedEpisode({ atFrame: null, durationFrames: null });
		const backwards = await patch(segmentId, { in: '2:00', out: '1:00' });
		expect(backwards.status).toBe(400);
		expect(backwards.body.issues.out[0]).toMatch(/has to come after the in point/);

		// The cut is 00:10:00;00 (17982 frames); 10:30 is past it.
		const pastEnd = await patch(segmentId, { in: '9:00', out: '10:30' });
		expect(pastEnd.status).toBe(400);
		expect(pastEnd.body.issues.out[0]).toContain('after the end of the cut (00:10:00;00)');
		const startsPastEnd = await patch(segmentId, { in: '10:10', out: '10:30' });
		expect(Object.keys(startsPastEnd.body.issues).sort()).toEqual(['in', 'out']);

		const typo = await patch(segmentId, { in: '1:7x', out: '2:00' });
		expect(typo.status).toBe(400);
		expect(typo.body.issues.in).toHaveLength(1);

		const oneEnd = await patch(segmentId, { in: '1:00', out: '' });
		expect(oneEnd.status).toBe(400);
		expect(oneEnd.body.issues.out[0]).toMatch(/out point too/);

		const [row] = await sql(`SELECT cut_in_frame, cut_out_frame FROM segment WHERE id = $1`, [
			segmentId
		]);
		expect(row).toEqual({ cut_in_frame: null, cut_out_frame: null });

		// Ending exactly at the cut's end is inside; clearing both takes it off the timeline.
		const toTheEnd = await patch(segmentId, { in: '9:00', out: '00:10:00;00' });
		expect(toTheEnd.status).toBe(200);
		expect(toTheEnd.body.span.outFrame).toBe(17982);
		const cleared = await patch(segmentId, { in: null, out: '' });
		expect(cleared.body.span).toMatchObject({ inFrame: null, outFrame: null });
	});

	test('a stale version is 409 with the current span; the host may not place segments; another channel is 404', async () => {
		const { segmentId } = await flaggedEpisode({ atFrame: null, durationFrames: null });
		const stale = await editor.api(`/api/segments/${segmentId}/span`, {
			method: 'PATCH',
			json: { in: '0:10', out: '0:50', version: (await segmentVersion(segmentId)) + 5 }
		});
		expect(stale.status).toBe(409);
		expect(stale.body.current).toMatchObject({ id: segmentId, inFrame: null });
		const host = await inTorquehaven(await signedIn(demo.host));
		expect((await patch(segmentId, { in: '0:10', out: '0:50' }, host)).status).toBe(403);
		const other = await signedIn(demo.otherProducer);
		expect((await patch(segmentId, { in: '0:10', out: '0:50' }, other)).status).toBe(404);
	});

	test('without JavaScript the edit page sets a span, and a refused one comes back with its field message', async () => {
		const { episodeId, segmentId } = await flaggedEpisode({ atFrame: null, durationFrames: null });
		const refused = await editor.action(`/episodes/${episodeId}/edit?/setSpan`, {
			segmentId,
			version: String(await segmentVersion(segmentId)),
			in: '3:00',
			out: '2:00'
		});
		expect(refused.status).toBe(400);
		expect(refused.data.errors.out[0]).toMatch(/has to come after the in point/);
		expect(refused.data.values).toMatchObject({ in: '3:00', out: '2:00' });
		const saved = await editor.action(`/episodes/${episodeId}/edit?/setSpan`, {
			segmentId,
			version: String(await segmentVersion(segmentId)),
			in: '0:30',
			out: '2:30'
		});
		expect(saved.type).toBe('redirect');
		const page = await (await editor.request(`/episodes/${episodeId}/edit`)).text();
		expect(page).toContain('aria-label="Segments"'); // the timeline's lane of spans
		expect(page).toContain('data-timeline-segment');
	});
});
