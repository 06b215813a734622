/**
 * What the media worker makes from each clip, in the crew's words, and the small arithmetic the
 * player needs (which thumbnail shows a moment, how a waveform's peaks map to time).
 * Pure module: no I/O, safe in the browser and on the server.
 */

/** proxy: a 720p H.264/AAC MP4 any browser plays; poster: one frame; sprite: thumbnails in a grid; peaks: the waveform. */
export const MEDIA_KINDS = ['proxy', 'poster', 'sprite', 'peaks'] as const;
export type MediaKind = (typeof MEDIA_KINDS)[number];

export const MEDIA_STATES = ['waiting', 'working', 'done', 'failed', 'skipped'] as const;
export type MediaState = (typeof MEDIA_STATES)[number];

export const MEDIA_KIND_LABELS: Record<MediaKind, string> = {
	proxy: 'Proxy',
	poster: 'Poster frame',
	sprite: 'Thumbnails',
	peaks: 'Waveform'
};

export function isMediaKind(value: unknown): value is MediaKind {
	return typeof value === 'string' && (MEDIA_KINDS as readonly string[]).includes(value);
}

/** The grid the sprite's thumbnails are laid out in, left to right, then top to bottom. */
export interface SpriteGrid {
	/** Seconds between thumbnails. */
	interval: number;
	columns: number;
	rows: number;
	count: number;
	tileWidth: number;
	tileHeight: number;
}

/** The most thumbnails one sprite holds: a long clip gets a wider interval, not a bigger image. */
export const SPRITE_MAX_TILES = 100;
export const SPRITE_COLUMNS = 10;
export const SPRITE_TILE = { width: 160, height: 90 } as const;

/** Seconds between thumbnails: every 2 s for a short clip, wider so a long one stays ≤ 100 tiles. */
export function spriteInterval(durationSeconds: number): number {
	if (!(durationSeconds > 0)) return 2;
	return Math.max(2, Math.ceil(durationSeconds / SPRITE_MAX_TILES));
}

/** The grid for a clip of this length (ffmpeg's fps filter takes a frame at 0, interval, 2·interval, …). */
export function spriteGridFor(durationSeconds: number): SpriteGrid {
	const interval = spriteInterval(durationSeconds);
	const count = Math.max(1, Math.min(SPRITE_MAX_TILES, Math.ceil(durationSeconds / interval)));
	const columns = Math.min(SPRITE_COLUMNS, count);
	return {
		interval,
		columns,
		rows: Math.ceil(count / columns),
		count,
		tileWidth: SPRITE_TILE.width,
		tileHeight: SPRITE_TILE.height
	};
}

/** The tile showing the moment `seconds` into the clip, and where it sits in the sprite (px). */
export function spriteTileAt(
	grid: SpriteGrid,
	seconds: number
): { index: number; x: number; y: number } {
	const index = Math.max(
		0,
		Math.min(grid.count - 1, Math.floor(Math.max(0, seconds) / grid.interval))
	);
	return {
		index,
		x: (index % grid.columns) * grid.tileWidth,
		y: Math.floor(index / grid.columns) * grid.tileHeight
	};
}

/** Audio peaks: the loudest sample (0–255 of full scale) in each slice of `1 / perSecond` s. */
export interface Peaks {
	perSecond: number;
	durationSeconds: number;
	peaks: number[];
}

/** Peaks per second for a clip: 10 for short clips, fewer so a long one keeps ≤ 20,000 values. */
export function peaksPerSecond(durationSeconds: number): number {
	if (!(durationSeconds > 0)) return 10;
	return Math.max(1, Math.min(10, Math.floor(20_000 / durationSeconds)));
}
