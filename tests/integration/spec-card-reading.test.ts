/**
 * Spec cards must stay on screen long enough to be read: about 17 characters a second (common
 * practice for subtitles, from memory; tests/REFERENCES.md, "Reading speed"), so a card needs its
 * characters ÷ 17 seconds, rounded up. The lift card of the bug report puts 687 characters on
 * screen: 687 ÷ 17 = 40.4 → 41 s, and it used to be saved with the 6 s default.
 */
import { beforeAll, describe, expect, test } from 'vitest';
import { Visitor, demo, signedIn, sql } from '../helpers/http';

let editor: Visitor;
let episodeId: string;

const fiveNoteLift = {
	kind: 'lift',
	frontLiftIn: 2,
	rearLiftIn: 3,
	frontSuspension: 'coil',
	rearSuspension: 'leaf',
	method: { front: 'coil-spacer', rear: 'coilovers' }
};
const cardsPath = () => `/api/episodes/${episodeId}/spec-cards`;

beforeAll(async () => {
	const [channel] = await sql(`SELECT id FROM channel WHERE name = 'Torquehaven Garage'`);
	editor = await signedIn(demo.editor);
	await editor.request('/channel?/switch', { method: 'POST', form: { channelId: channel.id } });
	const slug = `reading-${Date.now()}`;
	const [episode] = await sql(
		`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate, stage, cut_duration_frames)
		 VALUES ($1, 'Reading test', $2, 600, '29.97', 'edit', 17982) RETURNING id`,
		[channel.id, slug]
	);
	episodeId = episode.id;
});

describe('a spec card shown shorter than it takes to read', () => {
	test('a five-note lift card for 6 s is refused on its time field: it needs 41 s; nothing is saved', async () => {
		const before = await sql(`SELECT id FROM spec_card WHERE episode_id = $1`, [episodeId]);
		const answer = await editor.api(cardsPath(), {
			method: 'POST',
			json: { input: fiveNoteLift, at: '1:00', durationSeconds: 6 }
		});
		expect(answer.status).toBe(400);
		expect(answer.body.issues.durationSeconds[0]).toContain('687 characters');
		expect(answer.body.issues.durationSeconds[0]).toContain('needs 41 s to read');
		expect(await sql(`SELECT id FROM spec_card WHERE episode_id = $1`, [episodeId])).toEqual(
			before
		);
	});

	test('with 41 s it is saved; with no time typed it gets its reading time, not the 6 s default', async () => {
		const enough = await editor.api(cardsPath(), {
			method: 'POST',
			json: { input: fiveNoteLift, at: '1:00', durationSeconds: 41 }
		});
		expect(enough.status, JSON.stringify(enough.body)).toBe(201);
		expect(enough.body).toMatchObject({ neededSeconds: 41 });
		const untimed = await editor.api(cardsPath(), {
			method: 'POST',
			json: { input: fiveNoteLift, at: '2:00' }
		});
		expect(untimed.status).toBe(201);
		// 41 s × 30000/1001 = 1228.77 → 1229 frames (tests/REFERENCES.md, "Frame rates").
		expect(untimed.body.durationFrames).toBe(1229);
	});

	test('a change of figures that outgrows the time on screen is refused; a short torque card keeps 6 s', async () => {
		const torque = await editor.api(cardsPath(), {
			method: 'POST',
			json: {
				input: { kind: 'torque', value: 95, unit: 'ft·lbf', fastener: 'Lug nuts' },
				durationSeconds: 6
			}
		});
		expect(torque.status).toBe(201);
		expect(torque.body.neededSeconds).toBeLessThanOrEqual(6);
		const grown = await editor.api(`${cardsPath()}/${torque.body.id}`, {
			method: 'PATCH',
			json: { version: torque.body.version, input: fiveNoteLift }
		});
		expect(grown.status).toBe(400);
		expect(grown.body.issues.durationSeconds[0]).toContain('needs 41 s to read');
		const [row] = await sql(`SELECT kind, version FROM spec_card WHERE id = $1`, [torque.body.id]);
		expect(row).toEqual({ kind: 'torque', version: 1 });
	});

	test('the form action answers the same refusal on the time field, keeping what was typed', async () => {
		const failed = await editor.action(`/episodes/${episodeId}/spec-cards?/save`, {
			kind: 'lift',
			frontLiftIn: '2',
			rearLiftIn: '3',
			frontSuspension: 'coil',
			rearSuspension: 'leaf',
			'method.front': 'coil-spacer',
			'method.rear': 'coilovers',
			segmentId: '',
			at: '3:00',
			durationSeconds: '6'
		});
		expect(failed.status).toBe(400);
		expect(failed.data.errors.durationSeconds[0]).toContain('needs 41 s to read');
		expect(failed.data.values).toMatchObject({ durationSeconds: '6', frontLiftIn: '2' });
	});
});
