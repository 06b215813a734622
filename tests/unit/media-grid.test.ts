/**
 * The thumbnail sprite's grid and the waveform's density. The grid must match what FFmpeg's
 * `fps` and `tile` filters make (FFmpeg filter documentation: `fps=1/N` keeps one frame every N
 * seconds starting at the first; `tile=CxR` lays frames left to right, then top to bottom); the
 * integration test media-pipeline.test.ts checks a real sprite's pixel size with ffprobe.
 */
import { describe, expect, test } from 'vitest';
import { peaksPerSecond, spriteGridFor, spriteTileAt } from '../../src/lib/media';

describe('sprite grid', () => {
	test('a 3 s clip: a thumbnail every 2 s, two of them side by side', () => {
		expect(spriteGridFor(3)).toEqual({
			interval: 2,
			columns: 2,
			rows: 1,
			count: 2,
			tileWidth: 160,
			tileHeight: 90
		});
	});

	test('an hour-long clip stays at 100 thumbnails, 36 s apart, 10 × 10', () => {
		const grid = spriteGridFor(3600);
		expect([grid.interval, grid.count, grid.columns, grid.rows]).toEqual([36, 100, 10, 10]);
	});

	test('the tile for a moment: left to right, then down; clamped at both ends', () => {
		const grid = spriteGridFor(3600);
		expect(spriteTileAt(grid, 0)).toEqual({ index: 0, x: 0, y: 0 });
		expect(spriteTileAt(grid, 36 * 12 + 5)).toEqual({ index: 12, x: 2 * 160, y: 90 });
		expect(spriteTileAt(grid, 99_999).index).toBe(99);
		expect(spriteTileAt(grid, -4).index).toBe(0);
	});
});

describe('waveform density', () => {
	test('ten peaks a second for short clips, fewer so a long clip keeps ≤ 20,000 values', () => {
		expect(peaksPerSecond(30)).toBe(10);
		expect(peaksPerSecond(3 * 3600)).toBe(1);
		expect(Math.ceil(3 * 3600 * peaksPerSecond(3 * 3600))).toBeLessThanOrEqual(20_000 * 1.1);
		expect(peaksPerSecond(0)).toBe(10);
	});
});
