/**
 * The frame-rate label stored with uploaded footage. ffprobe reports a stream's rate as a fraction
 * (`avg_frame_rate`, `r_frame_rate`); the footage table's check (migration 2026-12-03-01) accepts a
 * positive decimal with up to three places, or null.
 */
import { describe, expect, test } from 'vitest';
import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { frameRateLabel, probeMedia } from '$lib/server/footage/probe';

/** The pattern of the footage_frame_rate_measured check, copied from the migration. */
const MEASURED_RATE = /^[0-9]+(\.[0-9]{1,3})?$/;

describe('frameRateLabel', () => {
	test('names the NTSC-family rates by their usual labels', () => {
		// The exact rates 24000/1001, 30000/1001 and 60000/1001 (SMPTE ST 12-1, via REFERENCES.md)
		// are called 23.976, 29.97 and 59.94 in the trade (common practice).
		expect(frameRateLabel('24000/1001')).toBe('23.976');
		expect(frameRateLabel('30000/1001')).toBe('29.97');
		expect(frameRateLabel('60000/1001')).toBe('59.94');
		expect(frameRateLabel('25/1')).toBe('25');
	});

	test('keeps a measured rate outside the programme rates, such as slow-motion 120 fps', () => {
		// 120 fps is a common slow-motion capture rate (common practice).
		expect(frameRateLabel('120/1')).toBe('120');
		expect(frameRateLabel('120000/1001')).toBe('119.88');
	});

	test('gives no label for an unknown or non-positive rate', () => {
		// ffprobe writes 0/0 when a stream has no average rate (FFmpeg's ffprobe output, from memory).
		expect(frameRateLabel('0/0')).toBeNull();
		expect(frameRateLabel(undefined)).toBeNull();
		expect(frameRateLabel('-30/1')).toBeNull();
	});

	test('every label it writes passes the footage table check', () => {
		for (const ratio of ['24000/1001', '30000/1001', '50/1', '120/1', '1/3', '2147483647/1'])
			expect(frameRateLabel(ratio)).toMatch(MEASURED_RATE);
	});
});

describe('probeMedia on a file ffprobe opens but that holds no picture or sound', () => {
	// Found when 50 MB of random bytes sometimes passed ffprobe as some container with no usable
	// stream: duration stayed empty and no note said why. A WebVTT file (W3C WebVTT, via
	// REFERENCES.md) is a deterministic stand-in: ffprobe reads it as one subtitle stream.
	test.skipIf(!existsSync('/usr/bin/ffprobe'))(
		'leaves the fields empty and says why in the note',
		async () => {
			const dir = mkdtempSync(path.join(tmpdir(), 'probe-'));
			const file = path.join(dir, 'captions.vtt');
			writeFileSync(file, 'WEBVTT\n\n00:00.000 --> 00:01.000\nLower the jack slowly.\n');
			try {
				const probe = await probeMedia(file);
				expect(probe.durationSeconds).toBeNull();
				expect(probe.frameRate).toBeNull();
				expect(probe.videoCodec).toBeNull();
				expect(probe.note).toMatch(/ffprobe found no video or audio/);
			} finally {
				rmSync(dir, { recursive: true, force: true });
			}
		}
	);
});
