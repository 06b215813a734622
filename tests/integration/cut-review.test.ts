/**
 * Cut review over HTTP: every cut upload is a numbered version with its change note; the crew
 * comments at a frame or over a range (roles, channel and field-level validation checked on the
 * server); a mention mails that crew member once through the outbox; open comments carry over to
 * the next version, shifted by an offset the editor previews and confirms; the producer approves;
 * the edit → locked gate names who fixes what; picture lock refuses a new cut.
 *
 * Outside references:
 * - SMPTE ST 12-1 drop-frame labels at 29.97 (the spec is paywalled), checked with the npm package
 *   `smpte-timecode`: labels ;00 and ;01 of minute 1 are skipped, so after 00:00:59;29 (frame
 *   1799) comes 00:01:00;02 (frame 1800 = 60 × 30 + 2 − 2). 00:01:00;00 is no label at all: the
 *   formula n = … + f − 2·(T − ⌊T/10⌋) would give it 1798, which is 00:00:59;28. 00:00:02;00 is
 *   frame 60, and a length of 00:00:58;00 is 58 × 30 = 1740 frames.
 * - tus 1.0.0 (creation, then PATCH) for the uploads, through tus-js-client as the footage page does.
 */
import { createRequire } from 'node:module';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import * as tus from 'tus-js-client';
import { createReadStream } from 'node:fs';
import { afterAll, beforeAll, describe, expect, inject, test } from 'vitest';
import { Visitor, demo, mailTo, signedIn, sql } from '../helpers/http';
import { FFMPEG } from '../helpers/media';
import { cutClip, uploadCutVersion } from '../helpers/cut-review';

const require = createRequire(import.meta.url);
const Timecode = require('smpte-timecode') as (
	timecode: string | number,
	rate: number,
	dropFrame: boolean
) => { frameCount: number; toString(): string };

const work = mkdtempSync(path.join(tmpdir(), 'wrenchroll-cut-review-'));
let producer: Visitor;
let host: Visitor;
let editor: Visitor;
let merch: Visitor;
let camera: Visitor;
let otherProducer: Visitor;
let episodeId = '';
let v1 = { id: '', number: 0, version: 0, change_note: '' };
let v2 = { id: '', number: 0, version: 0, change_note: '' };
const commentIds: string[] = [];

const base = () => `/api/episodes/${episodeId}/cut`;
const review = async () =>
	(await producer.api(`${base()}/versions`)).body as {
		versions: {
			id: string;
			number: number;
			label: string;
			changeNote: string;
			lengthFrames: number | null;
			approval: string;
			version: number;
		}[];
		comments: {
			id: string;
			versionId: string;
			startFrame: number;
			endFrame: number | null;
			state: string;
			carriedFrom: number | null;
			version: number;
			body: string;
		}[];
	};
const lockReasons = async () =>
	(
		(await producer.api(`/api/episodes/${episodeId}/stage`)).body as {
			reasons: { rule: string; message: string; fixedBy: string }[];
		}
	).reasons.filter((reason) => reason.rule.startsWith('cut-'));
const outboxTo = async (address: string) =>
	Number(
		(
			await sql(
				`SELECT count(*)::int AS n FROM outbox WHERE to_address = $1 AND subject LIKE '%mentioned you%'`,
				[address]
			)
		)[0].n
	);

beforeAll(async () => {
	[producer, host, editor, merch, camera, otherProducer] = await Promise.all([
		signedIn(demo.producer),
		signedIn(demo.host),
		signedIn(demo.editor),
		signedIn(demo.merch),
		signedIn(demo.camera),
		signedIn(demo.otherProducer)
	]);
	const [channel] = await sql(`SELECT id FROM channel WHERE name = 'Torquehaven Garage'`);
	// The editor works for two channels: this test's episode is Torquehaven's.
	await editor.request('/channel?/switch', { method: 'POST', form: { channelId: channel.id } });
	const slug = `cut-review-${Date.now()}`;
	// 29.97 with the rate's usual form (drop-frame), from 00:00:00;00.
	const [episode] = await sql(
		`INSERT INTO episode (channel_id, title, slug, target_runtime_seconds, frame_rate, stage)
		 VALUES ($1, 'Review test: rear shocks', $2, 600, '29.97', 'edit') RETURNING id`,
		[channel.id, slug]
	);
	episodeId = episode.id;
}, 60_000);
afterAll(() => rmSync(work, { recursive: true, force: true }));

describe.skipIf(!existsSync(FFMPEG))('cut review', () => {
	test('a cut upload becomes v1 with the editor’s change note and its length; the note can be rewritten', async () => {
		expect(await lockReasons()).toEqual([
			expect.objectContaining({ rule: 'cut-missing', fixedBy: 'editor' })
		]);
		v1 = await uploadCutVersion(
			editor,
			episodeId,
			cutClip(path.join(work, 'cut-v1.mp4')),
			'First assembly'
		);
		expect(v1.number).toBe(1);
		const { versions } = await review();
		expect(versions).toHaveLength(1);
		// 4 s at 30000/1001 fps = 119.88 → 120 frames (nearest frame).
		expect(versions[0]).toMatchObject({
			label: 'v1',
			changeNote: 'First assembly',
			lengthFrames: 120,
			approval: 'waiting'
		});

		const rewritten = await editor.api(`${base()}/versions/${v1.id}`, {
			method: 'PATCH',
			json: { changeNote: 'First assembly, no music yet', version: versions[0].version }
		});
		expect(rewritten.status, JSON.stringify(rewritten.body)).toBe(200);
		const stale = await editor.api(`${base()}/versions/${v1.id}`, {
			method: 'PATCH',
			json: { changeNote: 'older tab', version: versions[0].version }
		});
		expect(stale.status).toBe(409);
		const byHost = await host.api(`${base()}/versions/${v1.id}`, {
			method: 'PATCH',
			json: { changeNote: 'not mine', version: versions[0].version + 1 }
		});
		expect(byHost.status).toBe(403);
		expect((await review()).versions[0].changeNote).toBe('First assembly, no music yet');
	});

	test('comments: host, producer and merch may comment; the camera operator and another channel may not; bad fields are named', async () => {
		const post = (visitor: Visitor, json: Record<string, unknown>) =>
			visitor.api(`${base()}/comments`, { method: 'POST', json });
		const atFrame = await post(host, {
			versionId: v1.id,
			at: '00:00:02;00',
			body: 'Wheel spin looks too fast here.'
		});
		expect(atFrame.status, JSON.stringify(atFrame.body)).toBe(201);
		const range = await post(producer, {
			versionId: v1.id,
			at: '00:00:01;00',
			until: '00:00:03;00',
			body: 'Torque spec card missing over this span.'
		});
		expect(range.status, JSON.stringify(range.body)).toBe(201);
		const fromPlayer = await post(merch, {
			versionId: v1.id,
			atFrame: 90,
			body: 'Part number not legible.'
		});
		expect(fromPlayer.status, JSON.stringify(fromPlayer.body)).toBe(201);
		commentIds.push(atFrame.body.id, range.body.id, fromPlayer.body.id);

		expect((await post(camera, { versionId: v1.id, at: '0:01', body: 'x' })).status).toBe(403);
		expect((await post(otherProducer, { versionId: v1.id, at: '0:01', body: 'x' })).status).toBe(
			404
		);

		const empty = await post(host, { versionId: v1.id, at: '0:01', body: '   ' });
		expect(empty.status).toBe(400);
		expect(empty.body.issues.body[0]).toMatch(/Write the comment/);
		const typo = await post(host, { versionId: v1.id, at: '00:00:xx;00', body: 'typo' });
		expect(typo.status).toBe(400);
		expect(Object.keys(typo.body.issues)).toEqual(['at']);
		const past = await post(host, { versionId: v1.id, at: '00:00:10;00', body: 'after the end' });
		expect(past.status).toBe(400);
		expect(past.body.issues.at[0]).toContain('v1 ends at 00:00:04;00');
		const backwards = await post(host, {
			versionId: v1.id,
			at: '0:03',
			until: '0:01',
			body: 'range'
		});
		expect(backwards.status).toBe(400);
		expect(Object.keys(backwards.body.issues)).toEqual(['until']);
		const nowhere = await post(host, { versionId: v1.id, body: 'where?' });
		expect(nowhere.status).toBe(400);
		expect(Object.keys(nowhere.body.issues)).toEqual(['at']);

		const { comments } = await review();
		expect(comments.map((comment) => [comment.startFrame, comment.endFrame])).toEqual([
			[30, 90], // 00:00:01;00 to 00:00:03;00
			[60, null], // 00:00:02;00
			[90, null]
		]);
	});

	test('a mention mails each named crew member once through the outbox, never the writer', async () => {
		const before = Date.now();
		const mentioned = await host.api(`${base()}/comments/${commentIds[0]}/replies`, {
			method: 'POST',
			json: {
				body: '@Dana Okafor and @dana okafor, also @Priya Lindqvist: and @Rico Valdane (me).'
			}
		});
		expect(mentioned.status, JSON.stringify(mentioned.body)).toBe(201);
		expect(mentioned.body.mentioned).toBe(2);
		expect(await outboxTo('dana@torquehaven.test')).toBe(1);
		expect(await outboxTo('priya@torquehaven.test')).toBe(1);
		expect(await outboxTo('rico@torquehaven.test')).toBe(0);
		const mail = await mailTo('dana@torquehaven.test', {
			after: before,
			subject: 'mentioned you'
		});
		expect(mail.subject).toContain('mentioned you');
		expect(mail.text).toContain('v1 00:00:02;00');
		expect(mail.text).toContain(`/episodes/${episodeId}/screening`);
	});

	test('v2 arrives: open comments carry over at the same time; an offset is previewed, then confirmed', async () => {
		v2 = await uploadCutVersion(
			editor,
			episodeId,
			cutClip(path.join(work, 'cut-v2.mp4')),
			'Shortened the intro'
		);
		expect(v2.number).toBe(2);
		let { comments } = await review();
		expect(
			comments.every((comment) => comment.versionId === v2.id && comment.carriedFrom === 1)
		).toBe(true);
		expect(comments.map((comment) => comment.startFrame)).toEqual([30, 60, 90]);

		// The editor inserted material before the host's comment: 00:00:58;00 later.
		const shift = 58 * 30; // 1740 frames (a length; no labels skipped within minute 0)
		expect(Timecode('00:00:58;00', 29.97, true).frameCount).toBe(shift);
		const preview = await editor.api(
			`${base()}/versions/${v2.id}/carry?offset=${encodeURIComponent('+00:00:58;00')}`
		);
		expect(preview.status, JSON.stringify(preview.body)).toBe(200);
		expect(preview.body.offsetFrames).toBe(shift);
		const hostRow = preview.body.rows.find(
			(row: { commentId: string }) => row.commentId === commentIds[0]
		);
		// SMPTE ST 12-1 via smpte-timecode: frame 60 + 1740 = 1800 is labelled 00:01:00;02, and
		// 00:01:00;00 is a skipped label that neither smpte-timecode nor Wrenchroll accepts.
		expect(Timecode('00:01:00;02', 29.97, true).frameCount).toBe(1800);
		expect(Timecode(1800, 29.97, true).toString()).toBe('00:01:00;02');
		expect(() => Timecode('00:01:00;00', 29.97, true)).toThrow();
		const skipped = await editor.api(
			`${base()}/versions/${v2.id}/carry?offset=${encodeURIComponent('+00:01:00;00')}`
		);
		expect(skipped.status).toBe(400);
		expect(Object.keys(skipped.body.issues)).toEqual(['offset']);
		expect(hostRow).toMatchObject({ from: '00:00:02;00', to: '00:01:00;02' });
		// A preview writes nothing.
		expect((await review()).comments.map((comment) => comment.startFrame)).toEqual([30, 60, 90]);

		const badOffset = await editor.api(`${base()}/versions/${v2.id}/carry?offset=soon`);
		expect(badOffset.status).toBe(400);
		expect(Object.keys(badOffset.body.issues)).toEqual(['offset']);
		const byHost = await host.api(`${base()}/versions/${v2.id}/carry`, {
			method: 'POST',
			json: { offset: '+1', version: v2.version }
		});
		expect(byHost.status).toBe(403);

		const version = (await review()).versions[0].version;
		const confirmed = await editor.api(`${base()}/versions/${v2.id}/carry`, {
			method: 'POST',
			json: { offset: '+00:00:58;00', version }
		});
		expect(confirmed.status, JSON.stringify(confirmed.body)).toBe(200);
		expect(confirmed.body.moved).toBe(3);
		comments = (await review()).comments;
		const moved = comments.find((comment) => comment.id === commentIds[0])!;
		expect(moved.startFrame).toBe(1800);
		const range = comments.find((comment) => comment.id === commentIds[1])!;
		expect([range.startFrame, range.endFrame]).toEqual([30 + shift, 90 + shift]);

		// Confirming again replaces the offset instead of adding to it.
		const again = await editor.api(`${base()}/versions/${v2.id}/carry`, {
			method: 'POST',
			json: { offset: '0', version: version + 1 }
		});
		expect(again.status, JSON.stringify(again.body)).toBe(200);
		expect((await review()).comments.map((comment) => comment.startFrame)).toEqual([30, 60, 90]);

		// v1 is still playable, but comments go on v2 now.
		const onOld = await host.api(`${base()}/comments`, {
			method: 'POST',
			json: { versionId: v1.id, at: '0:01', body: 'late' }
		});
		expect(onOld.status).toBe(409);
		expect(onOld.body.error).toContain('replaced by v2');
		const file = await producer.request(
			`/api/footage/${(await sql(`SELECT footage_id FROM cut_version WHERE id = $1`, [v1.id]))[0].footage_id}/file`
		);
		expect(file.status).toBe(200);
	});

	test('answers: the editor resolves or answers won’t change (reason required); others may not answer for them', async () => {
		const versionOf = async (id: string) =>
			(await review()).comments.find((comment) => comment.id === id)!.version;
		const answer = (visitor: Visitor, id: string, json: Record<string, unknown>) =>
			visitor.api(`${base()}/comments/${id}`, { method: 'PATCH', json });

		const noReason = await answer(editor, commentIds[2], {
			state: 'wont_change',
			version: await versionOf(commentIds[2])
		});
		expect(noReason.status).toBe(400);
		expect(Object.keys(noReason.body.issues)).toEqual(['reason']);
		const notTheirs = await answer(host, commentIds[2], {
			state: 'resolved',
			version: await versionOf(commentIds[2])
		});
		expect(notTheirs.status).toBe(403);

		expect(await lockReasons()).toEqual([
			expect.objectContaining({
				rule: 'cut-comments-open',
				message: expect.stringMatching(/^3 open comments for the editor/),
				fixedBy: 'editor'
			}),
			expect.objectContaining({
				rule: 'cut-not-approved',
				message: expect.stringMatching(/^The producer has not approved v2/),
				fixedBy: 'producer'
			})
		]);

		for (const id of commentIds.slice(0, 2)) {
			const resolved = await answer(editor, id, {
				state: 'resolved',
				version: await versionOf(id)
			});
			expect(resolved.status, JSON.stringify(resolved.body)).toBe(200);
		}
		const wont = await answer(editor, commentIds[2], {
			state: 'wont_change',
			reason: 'The part number is in the description and the card.',
			version: await versionOf(commentIds[2])
		});
		expect(wont.status, JSON.stringify(wont.body)).toBe(200);
		expect((await review()).comments.map((comment) => comment.state).sort()).toEqual([
			'resolved',
			'resolved',
			'wont_change'
		]);
	});

	test('approval: only the producer, only the current version, a note when asking for changes; then the gate clears', async () => {
		const current = async () => (await review()).versions[0];
		const approve = (visitor: Visitor, versionId: string, json: Record<string, unknown>) =>
			visitor.api(`${base()}/versions/${versionId}/approval`, { method: 'POST', json });

		expect(
			(await approve(editor, v2.id, { decision: 'approved', version: (await current()).version }))
				.status
		).toBe(403);
		const noNote = await approve(producer, v2.id, {
			decision: 'changes',
			version: (await current()).version
		});
		expect(noNote.status).toBe(400);
		expect(Object.keys(noNote.body.issues)).toEqual(['note']);
		const old = await approve(producer, v1.id, { decision: 'approved', version: 3 });
		expect(old.status).toBe(409);

		const changes = await approve(producer, v2.id, {
			decision: 'changes',
			note: 'Music too loud in the intro.',
			version: (await current()).version
		});
		expect(changes.status, JSON.stringify(changes.body)).toBe(200);
		expect(await lockReasons()).toEqual([
			expect.objectContaining({
				rule: 'cut-not-approved',
				message: expect.stringMatching(/^The producer asked for changes to v2/),
				fixedBy: 'editor'
			})
		]);
		const approved = await approve(producer, v2.id, {
			decision: 'approved',
			version: (await current()).version
		});
		expect(approved.status, JSON.stringify(approved.body)).toBe(200);
		expect(await lockReasons()).toEqual([]);
	});

	test('picture lock fixes the approved version: a new cut upload and new comments are refused with the reason', async () => {
		await sql(`UPDATE episode SET stage = 'locked' WHERE id = $1`, [episodeId]);
		const refused = await new Promise<{ status: number; body: string }>((resolve, reject) => {
			const upload = new tus.Upload(createReadStream(path.join(work, 'cut-v2.mp4')), {
				endpoint: `${inject('baseUrl')}/api/uploads`,
				retryDelays: [],
				headers: { cookie: editor.cookieHeader(), origin: inject('baseUrl') },
				metadata: { filename: 'cut-v3.mp4', filetype: 'video/mp4', episodeId, purpose: 'cut' },
				onError: (failure) => {
					const response = (failure as tus.DetailedError).originalResponse;
					if (!response) return reject(failure);
					resolve({ status: response.getStatus(), body: response.getBody() });
				},
				onSuccess: () => reject(new Error('a cut was accepted at Locked'))
			});
			upload.start();
		});
		expect(refused.status).toBe(409);
		expect(refused.body).toMatch(/^The picture is locked/);
		const comment = await host.api(`${base()}/comments`, {
			method: 'POST',
			json: { versionId: v2.id, at: '0:01', body: 'late' }
		});
		expect(comment.status).toBe(409);
		expect((await review()).versions.map((version) => version.label)).toEqual(['v2', 'v1']);
	});
});
