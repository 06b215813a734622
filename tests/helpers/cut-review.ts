/**
 * Cut review helpers: upload a generated clip as the next version of an episode's cut over tus
 * (as the footage page does), and a fixture that gives an episode an approved version without
 * ffmpeg, for tests of other gate rules.
 */
import path from 'node:path';
import { expect, inject } from 'vitest';
import type { Visitor } from './http';
import { sql } from './http';
import { makeClip, uploadClip } from './media';

/** A small H.264 clip at 29.97 that Chromium plays as it is. */
export function cutClip(file: string, seconds = 4): string {
	return makeClip(file, {
		seconds,
		size: '320x180',
		rate: '30000/1001',
		video: ['-c:v', 'libx264', '-preset', 'ultrafast', '-pix_fmt', 'yuv420p'],
		audio: ['-c:a', 'aac'],
		timecode: '00:00:00;00'
	});
}

/** Uploads `file` as a cut of the episode; answers the new version's row. */
export async function uploadCutVersion(
	visitor: Visitor,
	episodeId: string,
	file: string,
	changeNote: string
) {
	const footageId = await uploadClip(visitor, inject('baseUrl'), file, {
		episodeId,
		purpose: 'cut',
		filetype: 'video/mp4',
		clipName: path.basename(file).replace(/\.[^.]+$/, ''),
		changeNote
	});
	const [version] = await sql(`SELECT * FROM cut_version WHERE footage_id = $1`, [footageId]);
	expect(version, `no version for footage ${footageId}`).toBeTruthy();
	return version as { id: string; number: number; version: number; change_note: string };
}

/** Gives the episode an approved v1 (rows only, no file): for tests of the other lock rules. */
export async function approvedCutFixture(episodeId: string): Promise<void> {
	const [episode] = await sql(`SELECT channel_id FROM episode WHERE id = $1`, [episodeId]);
	const [person] = await sql(
		`SELECT person_id FROM membership WHERE channel_id = $1 ORDER BY created_at LIMIT 1`,
		[episode.channel_id]
	);
	const uploadId = [...crypto.getRandomValues(new Uint8Array(16))]
		.map((byte) => byte.toString(16).padStart(2, '0'))
		.join('');
	await sql(
		`INSERT INTO upload (id, channel_id, person_id, episode_id, purpose, clip_name, file_name, file_type, size_bytes, completed_at)
		 VALUES ($1, $2, $3, $4, 'cut', 'fixture cut', 'fixture-cut.mp4', 'video/mp4', 1, now())`,
		[uploadId, episode.channel_id, person.person_id, episodeId]
	);
	const [footage] = await sql(
		`INSERT INTO footage (channel_id, episode_id, upload_id, purpose, clip_name, file_name, file_type, size_bytes, sha256)
		 VALUES ($1, $2, $3, 'cut', 'fixture cut', 'fixture-cut.mp4', 'video/mp4', 1, repeat('0', 64)) RETURNING id`,
		[episode.channel_id, episodeId, uploadId]
	);
	await sql(
		`INSERT INTO cut_version (episode_id, footage_id, number, approval, approved_at)
		 VALUES ($1, $2, coalesce((SELECT max(number) FROM cut_version WHERE episode_id = $1), 0) + 1, 'approved', now())`,
		[episodeId, footage.id]
	);
}
