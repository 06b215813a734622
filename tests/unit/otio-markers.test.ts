/**
 * Markers written to and read from OpenTimelineIO JSON, checked against outside sources
 * (tests/REFERENCES.md, "Edit-system markers" and "Timecode"):
 * - Field names: OpenTimelineIO's published serialized schema ("Serialized Data (Fields Only)",
 *   a page of the project's documentation):
 *   Timeline.1, Stack.1, Track.1, Gap.1, Marker.2, TimeRange.1, RationalTime.1 and their fields.
 *   Stacks and tracks also carry `children` (OTIO's composition JSON, from its example files).
 * - RationalTime: `value` counts frames at `rate`; value ÷ rate is seconds. Rates written exactly
 *   (30000/1001 for 29.97): SMPTE ST 12-1 and the exact rates in tests/REFERENCES.md, "Timecode".
 * - global_start_time: the timeline's start label in frames at the rate, e.g. 01:00:00;00 at 29.97
 *   drop-frame = 107892 (SMPTE ST 12-1; `smpte-timecode` agrees).
 * - No OpenTimelineIO reader is served by the npm registry here, so the JSON is checked field by
 *   field against the schema's names and read back with our own reader.
 */
import { createRequire } from 'node:module';
import { describe, expect, test } from 'vitest';
import { readOtio, writeOtio } from '$lib/edit/otio';
import type { Marker } from '$lib/edit/markers';
import { programmeClock, type FrameRate } from '$lib/timecode';

const smpte = createRequire(import.meta.url)('smpte-timecode') as (
	timecode: number | string,
	rate: [number, number] | number,
	dropFrame: boolean
) => { frameCount: number };

const clockAt = (frameRate: FrameRate, dropFrame: boolean, start = '01:00:00:00') =>
	programmeClock({ frameRate, dropFrame, start });

const markers: Marker[] = [
	{ frame: 0, durationFrames: 1800, kind: 'chapter', name: 'Opening and the plan', note: '' },
	{
		frame: 1800,
		durationFrames: 150,
		kind: 'caution',
		name: 'Caution: vehicle on stands',
		note: 'Support the vehicle on rated stands.'
	},
	{ frame: 17982, durationFrames: 0, kind: 'spec', name: 'Lift height', note: '' }
];

type Any = any;
const keys = (value: object) => Object.keys(value).sort();

describe('OpenTimelineIO at 29.97 drop-frame from 01:00:00;00', () => {
	const clock = clockAt('29.97', true);
	const timeline: Any = JSON.parse(writeOtio(markers, 'Rear lift', clock, 20000));

	test('every object names its schema and carries exactly the published fields', () => {
		// Field lists from OTIO's "Serialized Data (Fields Only)", plus OTIO_SCHEMA (and children).
		expect(timeline.OTIO_SCHEMA).toBe('Timeline.1');
		expect(keys(timeline)).toEqual(
			['OTIO_SCHEMA', 'global_start_time', 'metadata', 'name', 'tracks'].sort()
		);
		const stack = timeline.tracks;
		expect(stack.OTIO_SCHEMA).toBe('Stack.1');
		expect(keys(stack)).toEqual(
			[
				'OTIO_SCHEMA',
				'children',
				'effects',
				'enabled',
				'markers',
				'metadata',
				'name',
				'source_range'
			].sort()
		);
		const track = stack.children[0];
		expect(track.OTIO_SCHEMA).toBe('Track.1');
		expect(track.kind).toBe('Video');
		expect(keys(track)).toEqual([...keys(stack), 'kind'].sort());
		expect(track.children[0].OTIO_SCHEMA).toBe('Gap.1');
		for (const marker of stack.markers) {
			expect(marker.OTIO_SCHEMA).toBe('Marker.2');
			expect(keys(marker)).toEqual(
				['OTIO_SCHEMA', 'color', 'comment', 'marked_range', 'metadata', 'name'].sort()
			);
			expect(marker.marked_range.OTIO_SCHEMA).toBe('TimeRange.1');
			expect(keys(marker.marked_range)).toEqual(['OTIO_SCHEMA', 'duration', 'start_time']);
			expect(keys(marker.marked_range.start_time)).toEqual(['OTIO_SCHEMA', 'rate', 'value']);
			expect(marker.marked_range.start_time.OTIO_SCHEMA).toBe('RationalTime.1');
		}
	});

	test('RationalTime rate is the exact 30000/1001 and values are frames from the cut’s first frame', () => {
		const starts = timeline.tracks.markers.map((marker: Any) => marker.marked_range.start_time);
		for (const start of starts) expect(start.rate).toBe(30000 / 1001);
		expect(starts.map((start: Any) => start.value)).toEqual([0, 1800, 17982]);
		expect(
			timeline.tracks.markers.map((marker: Any) => marker.marked_range.duration.value)
		).toEqual([1800, 150, 0]);
		// 17982 frames at 30000/1001 fps last 599.9994 s: ten minutes of drop-frame labels (SMPTE ST 12-1).
		expect(17982 / starts[2].rate).toBeCloseTo(599.9994, 4);
	});

	test('global_start_time is the 01:00:00;00 label count, 107892', () => {
		expect(timeline.global_start_time).toEqual({
			OTIO_SCHEMA: 'RationalTime.1',
			rate: 30000 / 1001,
			value: 107892
		});
		expect(smpte('01:00:00;00', [30000, 1001], true).frameCount).toBe(107892);
	});

	test('marker names, comments and colours (OTIO’s own colour names)', () => {
		expect(
			timeline.tracks.markers.map((marker: Any) => [marker.name, marker.color, marker.comment])
		).toEqual([
			['Opening and the plan', 'GREEN', ''],
			['Caution: vehicle on stands', 'RED', 'Support the vehicle on rated stands.'],
			['Lift height', 'YELLOW', '']
		]);
		expect(timeline.tracks.markers[1].metadata).toEqual({ wrenchroll: { kind: 'caution' } });
	});

	test('read back, every marker lands on its frame with its kind', () => {
		const read = readOtio(JSON.stringify(timeline), clock);
		expect(read.errors).toEqual([]);
		expect(read.markers).toEqual([
			{ where: 'tracks.markers[0]', frame: 0, kind: 'chapter', name: 'Opening and the plan' },
			{
				where: 'tracks.markers[1]',
				frame: 1800,
				kind: 'caution',
				name: 'Caution: vehicle on stands'
			},
			{ where: 'tracks.markers[2]', frame: 17982, kind: 'spec', name: 'Lift height' }
		]);
	});
});

describe('OpenTimelineIO at 25 fps from 01:00:00:00', () => {
	const clock = clockAt('25', false);
	const timeline: Any = JSON.parse(
		writeOtio(
			[{ frame: 1500, durationFrames: 250, kind: 'chapter', name: 'Tools', note: '' }],
			'Brake bleed',
			clock,
			3000
		)
	);

	test('rate 25, start 90000 (one hour of 25 labels a second), marker at 1500 = 60 s', () => {
		expect(timeline.global_start_time).toEqual({
			OTIO_SCHEMA: 'RationalTime.1',
			rate: 25,
			value: 90000
		});
		const start = timeline.tracks.markers[0].marked_range.start_time;
		expect(start).toEqual({ OTIO_SCHEMA: 'RationalTime.1', rate: 25, value: 1500 });
		expect(start.value / start.rate).toBe(60);
		expect(timeline.tracks.children[0].children[0].source_range.duration.value).toBe(3000);
	});
});

describe('reading an OpenTimelineIO file the editor uploads', () => {
	const clock = clockAt('29.97', true);
	const wrap = (markersJson: unknown[], trackMarkers: unknown[] = []) =>
		JSON.stringify({
			OTIO_SCHEMA: 'Timeline.1',
			name: 'x',
			global_start_time: null,
			metadata: {},
			tracks: {
				OTIO_SCHEMA: 'Stack.1',
				markers: markersJson,
				children: [{ OTIO_SCHEMA: 'Track.1', kind: 'Video', markers: trackMarkers, children: [] }]
			}
		});
	const marker = (name: unknown, value: unknown, rate: unknown = 29.97) => ({
		OTIO_SCHEMA: 'Marker.2',
		name,
		color: 'PURPLE',
		metadata: {},
		marked_range: {
			OTIO_SCHEMA: 'TimeRange.1',
			start_time: { OTIO_SCHEMA: 'RationalTime.1', rate, value },
			duration: { OTIO_SCHEMA: 'RationalTime.1', rate, value: 0 }
		}
	});

	test('a rate written as 29.97 reads as the episode’s rate; another rate goes through real time', () => {
		const read = readOtio(wrap([marker('A', 300)], [marker('B', 250, 25)]), clock);
		expect(read.errors).toEqual([]);
		// 250 frames at 25 fps = 10 s = 299.7 frames at 30000/1001 → 300 (nearest frame).
		expect(read.markers).toEqual([
			{ where: 'tracks.markers[0]', frame: 300, kind: null, name: 'A' },
			{ where: 'tracks.children[0].markers[0]', frame: 300, kind: null, name: 'B' }
		]);
	});

	test('each bad item is named by its path, in plain words', () => {
		const read = readOtio(
			wrap([marker('', 10), marker('C', -5), { OTIO_SCHEMA: 'Clip.2' }, marker('D', 'x')]),
			clock
		);
		expect(read.errors.map((error) => error.where)).toEqual([
			'tracks.markers[0].name',
			'tracks.markers[1].marked_range.start_time',
			'tracks.markers[2]',
			'tracks.markers[3].marked_range.start_time'
		]);
		expect(read.errors[1].message).toMatch(/before the start/);
	});

	test('not JSON, or JSON that is no timeline, is one plain error', () => {
		expect(readOtio('{"OTIO_SCHEMA": ', clock).errors[0].message).toMatch(/isn't valid JSON/);
		expect(readOtio('{"OTIO_SCHEMA": "Clip.2"}', clock).errors[0]).toMatchObject({
			where: 'OTIO_SCHEMA'
		});
	});
});
