/**
 * A clip recorded at another frame rate than its episode: flagged on the footage row and named in the
 * shoot → edit gate. 30 fps and 29.97 fps (30000/1001) are different rates, so a 30 fps clip in a
 * 29.97 cut runs 0.1 % fast or repeats a frame every 33 s (tests/REFERENCES.md, "Frame rates");
 * 59.94 is a whole multiple, overcranked for slow motion (common practice), and passes.
 */
import { afterAll, beforeAll, expect, test } from 'vitest';
import { demo, signedIn, sql, type Visitor } from '../helpers/http';

let producer: Visitor;
let episodeId: string;
let footageId: string;

beforeAll(async () => {
	producer = await signedIn(demo.producer);
	const created = await producer.api('/api/episodes', {
		method: 'POST',
		json: { title: `Rate check ${Date.now()}`, targetRuntimeSeconds: 600, frameRate: '29.97' }
	});
	expect(created.status).toBe(201);
	episodeId = created.body.episode.id;
	const segment = await producer.api(`/api/episodes/${episodeId}/segments`, {
		method: 'POST',
		json: {
			kind: 'install-step',
			title: 'Torque the U-bolts',
			plannedSeconds: 90,
			needsFootage: true
		}
	});
	const shot = await producer.api(`/api/segments/${segment.body.segment.id}/shots`, {
		method: 'POST',
		json: { what: 'Wrench on the nut', angle: '', roll: 'A', camera: '', notes: '' }
	});
	expect(shot.status).toBe(201);
	const [episode] = await sql(`SELECT channel_id FROM episode WHERE id = $1`, [episodeId]);
	const [footage] = await sql(
		`INSERT INTO footage (channel_id, episode_id, upload_id, purpose, clip_name, file_name, file_type, size_bytes, sha256, frame_rate)
		 VALUES ($1, $2, $3, 'footage', 'ACAM_3001', 'ACAM_3001.mov', 'video/quicktime', 1000, $4, '30') RETURNING id`,
		[episode.channel_id, episodeId, `rate-${Date.now()}`, 'b'.repeat(64)]
	);
	footageId = footage.id;
	await sql(
		`INSERT INTO take (shot_id, clip_name, source_in_frames, source_out_frames, good, footage_id) VALUES ($1, 'ACAM_3001', 0, 300, true, $2)`,
		[shot.body.shot.id, footageId]
	);
	// The shoot itself is not what this test is about: put the episode at the shoot stage.
	await sql(`UPDATE episode SET stage = 'shoot' WHERE id = $1`, [episodeId]);
});

afterAll(async () => {
	await sql(`DELETE FROM episode WHERE id = $1`, [episodeId]);
});

const gateRules = async () => {
	const answer = await producer.api(`/api/episodes/${episodeId}/stage`, {
		method: 'POST',
		json: { from: 'shoot', to: 'edit' }
	});
	return answer.body.gate?.reasons ?? [];
};

test('the footage row says the clip was recorded at 30 fps for a 29.97 fps episode', async () => {
	const page = await (await producer.request(`/episodes/${episodeId}/footage`)).text();
	expect(page).toContain('data-testid="rate-mismatch"');
	expect(page).toMatch(/Recorded at 30 fps; the episode runs at 29\.97 fps/);
});

test('the shoot → edit gate names the clip and both rates; at 59.94 (slow motion) it does not', async () => {
	const mismatch = (await gateRules()).find(
		(reason: { rule: string }) => reason.rule === 'footage-rate-mismatch'
	);
	expect(mismatch.message).toContain('ACAM_3001 at 30 fps');
	expect(mismatch.message).toContain('29.97 fps');
	await sql(`UPDATE footage SET frame_rate = '59.94' WHERE id = $1`, [footageId]);
	expect((await gateRules()).map((reason: { rule: string }) => reason.rule)).not.toContain(
		'footage-rate-mismatch'
	);
	const page = await (await producer.request(`/episodes/${episodeId}/footage`)).text();
	expect(page).not.toContain('data-testid="rate-mismatch"');
	expect(page).toContain('Slow motion: 59.94 fps');
});
