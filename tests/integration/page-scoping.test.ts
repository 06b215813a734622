/**
 * A page's forms act only on the records of the episode or shoot day in the page's address, answer
 * bad input with a 400 in words instead of a server error, and tokens and profiles stay within the
 * caller's channel. Status codes per RFC 9110 §15.5 (400 Bad Request, 403 Forbidden, 404 Not Found).
 */
import { beforeAll, describe, expect, test } from 'vitest';
import { Visitor, demo, signedIn, sql } from '../helpers/http';

let torquehaven: string;
let producer: Visitor;
let camera: Visitor;
let merch: Visitor;

/** Two different episodes of the Torquehaven channel that both have shots. */
async function twoEpisodesWithShots() {
	const rows = await sql(
		// The first is an episode whose shot list is still open (locked and published fix it).
		`SELECT episode_id, shot_id, segment_id FROM (
		   SELECT DISTINCT ON (e.id) e.id AS episode_id, sh.id AS shot_id, s.id AS segment_id,
		          e.stage IN ('locked', 'published') AS fixed
		   FROM shot sh JOIN segment s ON s.id = sh.segment_id JOIN episode e ON e.id = s.episode_id
		   WHERE e.channel_id = $1 ORDER BY e.id) AS pairs
		 ORDER BY fixed, episode_id LIMIT 2`,
		[torquehaven]
	);
	expect(rows.length, 'the demo has shots in two episodes').toBe(2);
	return { page: rows[0], other: rows[1] };
}

beforeAll(async () => {
	[{ id: torquehaven }] = await sql(`SELECT id FROM channel WHERE name = 'Torquehaven Garage'`);
	producer = await signedIn(demo.producer);
	camera = await signedIn(demo.camera);
	merch = await signedIn(demo.merch);
});

describe('forms act on their own page’s episode', () => {
	test('the shot list page refuses a segment, shot or take of another episode, and adds nothing', async () => {
		const { page, other } = await twoEpisodesWithShots();
		const [otherTake] = await sql(
			`SELECT t.id, t.version FROM take t WHERE t.shot_id = $1 LIMIT 1`,
			[other.shot_id]
		);
		const shotsBefore = (await sql(`SELECT count(*)::int AS n FROM shot`))[0].n;
		const takesBefore = (await sql(`SELECT count(*)::int AS n FROM take`))[0].n;

		const addShot = await camera.action(`/episodes/${page.episode_id}/shots?/addShot`, {
			segmentId: other.segment_id,
			what: 'Wheel off, hub face',
			angle: 'Low',
			roll: 'A',
			camera: 'A-cam',
			notes: ''
		});
		expect(addShot.status).toBe(404);
		expect(addShot.data.errors.form[0]).toMatch(/not in this episode/);
		const logTake = await camera.action(`/episodes/${page.episode_id}/shots?/logTake`, {
			shotId: other.shot_id,
			clipName: 'ACAM_999001',
			sourceIn: '01:00:00:00',
			sourceOut: '01:00:10:00',
			note: ''
		});
		expect(logTake.status).toBe(404);
		if (otherTake) {
			expect(
				(
					await camera.action(`/episodes/${page.episode_id}/shots?/updateTake`, {
						takeId: otherTake.id,
						version: String(otherTake.version),
						good: 'false'
					})
				).status
			).toBe(404);
			expect(
				(
					await camera.action(`/episodes/${page.episode_id}/shots?/deleteTake`, {
						takeId: otherTake.id
					})
				).status
			).toBe(404);
		}
		expect((await sql(`SELECT count(*)::int AS n FROM shot`))[0].n).toBe(shotsBefore);
		expect((await sql(`SELECT count(*)::int AS n FROM take`))[0].n).toBe(takesBefore);

		// On its own page a segment's shot is fine.
		const own = await camera.action(`/episodes/${page.episode_id}/shots?/addShot`, {
			segmentId: page.segment_id,
			what: 'Wheel off, hub face',
			angle: 'Low',
			roll: 'A',
			camera: 'A-cam',
			notes: ''
		});
		expect(own.type).toBe('success');
		await sql(`DELETE FROM shot WHERE segment_id = $1 AND what = 'Wheel off, hub face'`, [
			page.segment_id
		]);
	});

	test('the notes page refuses a note of another episode, and a removal without a version is a 400', async () => {
		const notes = await sql(
			`SELECT DISTINCT ON (n.episode_id) n.id, n.episode_id, n.version, n.text FROM segment_note n JOIN episode e ON e.id = n.episode_id WHERE e.channel_id = $1 ORDER BY n.episode_id LIMIT 2`,
			[torquehaven]
		);
		expect(notes.length, 'the demo has notes in two episodes').toBe(2);
		const [here, there] = notes;
		const edited = await producer.action(`/episodes/${here.episode_id}/notes?/write`, {
			noteId: there.id,
			version: String(there.version),
			text: 'Moved from the wrong page'
		});
		expect(edited.status).toBe(404);
		expect(
			(
				await producer.action(`/episodes/${here.episode_id}/notes?/remove`, {
					noteId: there.id,
					version: String(there.version)
				})
			).status
		).toBe(404);
		const noVersion = await producer.action(`/episodes/${here.episode_id}/notes?/remove`, {
			noteId: here.id
		});
		expect(noVersion.status).toBe(400);
		expect(noVersion.data.errors.version[0]).toMatch(/Reload the page/);
		expect(
			await sql(`SELECT text, version FROM segment_note WHERE id = ANY($1) ORDER BY id`, [
				[here.id, there.id]
			])
		).toEqual(
			[here, there]
				.sort((a, b) => (a.id < b.id ? -1 : 1))
				.map(({ text, version }) => ({ text, version }))
		);
	});

	test('the footage page refuses to delete a clip of another episode', async () => {
		const [clip] = await sql(
			`SELECT f.id, f.episode_id FROM footage f WHERE f.channel_id = $1 LIMIT 1`,
			[torquehaven]
		);
		const [otherEpisode] = await sql(
			`SELECT id FROM episode WHERE channel_id = $1 AND id <> $2 LIMIT 1`,
			[torquehaven, clip.episode_id]
		);
		const answer = await producer.action(`/episodes/${otherEpisode.id}/footage?/delete`, {
			id: clip.id
		});
		expect(answer.status).toBe(404);
		expect(await sql(`SELECT id FROM footage WHERE id = $1`, [clip.id])).toHaveLength(1);
	});
});

describe('forms act on their own page’s shoot day', () => {
	test('ticking or removing a pull-list item of another day is refused; deleting a day twice is a 404, not an error page', async () => {
		const [day] = await sql(`SELECT id, episode_id FROM shoot_day WHERE channel_id = $1 LIMIT 1`, [
			torquehaven
		]);
		const [spare] = await sql(
			`INSERT INTO shoot_day (channel_id, episode_id, shoot_date, location_name, call_time, wrap_time) VALUES ($1, $2, '2027-03-01', 'Spare bay', '08:00', '15:00') RETURNING id`,
			[torquehaven, day.episode_id]
		);
		const [item] = await sql(
			`INSERT INTO pull_item (shoot_day_id, label, quantity, source) VALUES ($1, 'Brake line, 18 in', 2, 'extra') RETURNING id, version, on_hand`,
			[day.id]
		);
		const tick = await merch.action(`/shoots/${spare.id}?/onHand`, {
			id: item.id,
			onHand: 'true',
			version: String(item.version)
		});
		expect(tick.status).toBe(404);
		expect((await merch.action(`/shoots/${spare.id}?/removePull`, { id: item.id })).status).toBe(
			404
		);
		expect((await sql(`SELECT on_hand FROM pull_item WHERE id = $1`, [item.id]))[0]).toEqual({
			on_hand: false
		});
		// On its own day it works.
		expect(
			(
				await merch.action(`/shoots/${day.id}?/onHand`, {
					id: item.id,
					onHand: 'true',
					version: String(item.version)
				})
			).type
		).toBe('success');
		await sql(`DELETE FROM pull_item WHERE id = $1`, [item.id]);

		expect((await producer.action(`/shoots/${spare.id}?/delete`, {})).type).toBe('redirect');
		const again = await producer.action(`/shoots/${spare.id}?/delete`, {});
		expect(again.status).toBe(404);
		expect(again.data.errors.form[0]).toMatch(/not found/);
	});
});

describe('bad input on the part page', () => {
	test('retire and remove without a version are a 400 that names the field, and the part is unchanged', async () => {
		const [part] = await sql(
			`SELECT id, status, version FROM part WHERE channel_id = $1 AND status = 'active' LIMIT 1`,
			[torquehaven]
		);
		for (const action of ['retire', 'remove']) {
			const answer = await merch.action(`/parts/${part.id}?/${action}`, {});
			expect(answer.status, action).toBe(400);
			expect(answer.data.errors.version[0], action).toMatch(/Reload the page/);
			expect(
				(await merch.action(`/parts/${part.id}?/${action}`, { version: 'one' })).status,
				action
			).toBe(400);
		}
		expect((await sql(`SELECT status, version FROM part WHERE id = $1`, [part.id]))[0]).toEqual({
			status: part.status,
			version: part.version
		});
	});
});

describe('tokens and profiles stay in the caller’s channel', () => {
	test('a token of one channel cannot be revoked from another, and a token cannot make tokens', async () => {
		// The shared editor works for both channels: a token made in Torquehaven…
		const editor = await signedIn(demo.editor);
		expect(
			(
				await editor.request('/channel?/switch', {
					method: 'POST',
					form: { channelId: torquehaven }
				})
			).status
		).toBe(303);
		const made = await editor.api('/api/tokens', { method: 'POST', json: { label: 'edit bay' } });
		expect(made.status).toBe(201);
		// …is not theirs to revoke while working in the other channel.
		const [other] = await sql(
			`SELECT m.channel_id FROM membership m JOIN person p ON p.id = m.person_id WHERE p.email = $1 AND m.channel_id <> $2`,
			[demo.editor, torquehaven]
		);
		expect(
			(
				await editor.request('/channel?/switch', {
					method: 'POST',
					form: { channelId: other.channel_id }
				})
			).status
		).toBe(303);
		expect(
			(await editor.api(`/api/tokens/${made.body.token.id}`, { method: 'DELETE' })).status
		).toBe(404);
		expect(
			(await sql(`SELECT revoked_at FROM api_token WHERE id = $1`, [made.body.token.id]))[0]
				.revoked_at
		).toBeNull();

		const viaToken = new Visitor();
		const minted = await viaToken.api('/api/tokens', {
			method: 'POST',
			json: { label: 'copy' },
			headers: { authorization: `Bearer ${made.body.token.token}` }
		});
		expect(minted.status).toBe(403);
		expect(minted.body.error).toMatch(/signed in/);
		await sql(`UPDATE api_token SET revoked_at = now() WHERE id = $1`, [made.body.token.id]);
	});

	test('another channel’s recording profile is a 404 to delete, even when it is in use there', async () => {
		// A profile of the other channel, used by a camera on one of its shoot days.
		const [episode] = await sql(
			`SELECT id, channel_id FROM episode WHERE channel_id <> $1 LIMIT 1`,
			[torquehaven]
		);
		const [theirs] = await sql(
			`INSERT INTO recording_profile (channel_id, name, camera, codec, resolution, frame_rate, bitrate_mbps) VALUES ($1, 'Their profile', 'Body B', 'Intra 10-bit', 'UHD', '29.97', 400) RETURNING id`,
			[episode.channel_id]
		);
		const [day] = await sql(
			`INSERT INTO shoot_day (channel_id, episode_id, shoot_date, location_name, call_time, wrap_time) VALUES ($1, $2, '2027-03-02', 'Their bay', '08:00', '15:00') RETURNING id`,
			[episode.channel_id, episode.id]
		);
		await sql(
			`INSERT INTO shoot_day_camera (shoot_day_id, label, profile_id) VALUES ($1, 'B-cam', $2)`,
			[day.id, theirs.id]
		);
		const answer = await camera.action('/shoots/profiles?/delete', { id: theirs.id });
		expect(answer.status).toBe(404);
		expect(answer.data.errors.form[0]).toMatch(/not found/);
		await sql(`DELETE FROM shoot_day WHERE id = $1`, [day.id]);
		await sql(`DELETE FROM recording_profile WHERE id = $1`, [theirs.id]);
	});
});
