/**
 * OpenTimelineIO JSON carrying markers (the Academy Software Foundation's open interchange
 * format). Field names per the project's published serialized schema ("Serialized Data (Fields
 * Only)"): Timeline.1 { name, metadata, global_start_time, tracks }, Stack.1 and Track.1
 * { name, metadata, source_range, effects, markers, enabled, children (+ kind) }, Gap.1,
 * Marker.2 { name, metadata, color, comment, marked_range }, TimeRange.1 { start_time, duration },
 * RationalTime.1 { rate, value }.
 *
 * The markers sit on the timeline's stack, whose time starts at 0 at the cut's first frame; the
 * start label (01:00:00:00 and the like) is `global_start_time`, counted in frame labels at the
 * rate. Rates are written exactly (30000/1001 for 29.97), so value ÷ rate is real time.
 */
import { exactFps, type ProgrammeClock } from '$lib/timecode';
import {
	IMPORTED_NAME_LIMIT,
	MARKER_KINDS,
	inMarkerOrder,
	oneLine,
	type Marker,
	type MarkerKind,
	type MarkerRead,
	type ReadMarker,
	type RowError
} from './markers';

/** The colour each kind is written with, from OTIO's own marker colour names. */
export const OTIO_MARKER_COLOURS: Record<MarkerKind, string> = {
	chapter: 'GREEN',
	caution: 'RED',
	spec: 'YELLOW',
	comment: 'CYAN'
};

/** The metadata key our own facts sit under, as OTIO asks of every tool (a namespace per writer). */
export const OTIO_METADATA_KEY = 'wrenchroll';

/** The exact rate as OTIO's floating-point `rate` (29.97002997… for 29.97). */
export function otioRate(clock: ProgrammeClock): number {
	const { numerator, denominator } = exactFps(clock.rate);
	return numerator / denominator;
}

const rationalTime = (value: number, rate: number) => ({
	OTIO_SCHEMA: 'RationalTime.1',
	rate,
	value
});

const timeRange = (start: number, duration: number, rate: number) => ({
	OTIO_SCHEMA: 'TimeRange.1',
	duration: rationalTime(duration, rate),
	start_time: rationalTime(start, rate)
});

/** The markers as an OTIO timeline: one video track spanning the cut, the markers on its stack. */
export function writeOtio(
	markers: readonly Marker[],
	title: string,
	clock: ProgrammeClock,
	cutDurationFrames: number | null
): string {
	const rate = otioRate(clock);
	const length = Math.max(
		cutDurationFrames ?? 0,
		...markers.map((marker) => marker.frame + marker.durationFrames)
	);
	const timeline = {
		OTIO_SCHEMA: 'Timeline.1',
		metadata: {
			[OTIO_METADATA_KEY]: { dropFrame: clock.dropFrame, startTimecode: clock.startLabel }
		},
		name: oneLine(title),
		global_start_time: rationalTime(clock.startFrame, rate),
		tracks: {
			OTIO_SCHEMA: 'Stack.1',
			metadata: {},
			name: 'tracks',
			source_range: null,
			effects: [],
			markers: inMarkerOrder(markers).map((marker) => ({
				OTIO_SCHEMA: 'Marker.2',
				metadata: { [OTIO_METADATA_KEY]: { kind: marker.kind } },
				name: oneLine(marker.name),
				color: OTIO_MARKER_COLOURS[marker.kind],
				comment: marker.note,
				marked_range: timeRange(marker.frame, marker.durationFrames, rate)
			})),
			enabled: true,
			children: [
				{
					OTIO_SCHEMA: 'Track.1',
					metadata: {},
					name: 'Cut',
					source_range: null,
					effects: [],
					markers: [],
					enabled: true,
					kind: 'Video',
					children:
						length > 0
							? [
									{
										OTIO_SCHEMA: 'Gap.1',
										metadata: {},
										name: '',
										source_range: timeRange(0, length, rate),
										effects: [],
										markers: [],
										enabled: true
									}
								]
							: []
				}
			]
		}
	};
	return JSON.stringify(timeline, null, 2) + '\n';
}

type Json = Record<string, unknown>;
const isObject = (value: unknown): value is Json =>
	typeof value === 'object' && value !== null && !Array.isArray(value);
const schemaOf = (value: Json) => (typeof value.OTIO_SCHEMA === 'string' ? value.OTIO_SCHEMA : '');

/** A marker's frame at the episode's rate from a RationalTime, or the reason it can't be read. */
function frameOf(time: unknown, exact: number): number | string {
	if (!isObject(time) || !schemaOf(time).startsWith('RationalTime.'))
		return 'should be a RationalTime with a rate and a value.';
	const { rate, value } = time;
	if (typeof rate !== 'number' || !(rate > 0))
		return 'has no rate; a RationalTime needs a rate above 0.';
	if (typeof value !== 'number' || !Number.isFinite(value))
		return 'has no value; a RationalTime needs a number of frames.';
	if (value < 0) return `is ${value} frames, before the start of the cut.`;
	// The same rate (within rounding of how it was written): the value is the frame; else convert through real time.
	const frame =
		Math.abs(rate - exact) < 0.001 ? Math.round(value) : Math.round((value / rate) * exact);
	if (!Number.isSafeInteger(frame) || frame > 2_000_000_000)
		return 'is far past the end of any cut.';
	return frame;
}

function readMarker(item: unknown, where: string, exact: number): ReadMarker | RowError {
	if (!isObject(item) || !schemaOf(item).startsWith('Marker.'))
		return { where, message: 'This item should be a Marker (OTIO_SCHEMA "Marker.2").' };
	const start = isObject(item.marked_range) ? item.marked_range.start_time : undefined;
	const frame = frameOf(start, exact);
	if (typeof frame === 'string')
		return { where: `${where}.marked_range.start_time`, message: `The marker's start ${frame}` };
	const name = oneLine(typeof item.name === 'string' ? item.name : '');
	if (name === '')
		return { where: `${where}.name`, message: 'This marker has no name; give it a name.' };
	if (name.length > IMPORTED_NAME_LIMIT)
		return {
			where: `${where}.name`,
			message: `This marker's name runs ${name.length} characters; keep it under ${IMPORTED_NAME_LIMIT}.`
		};
	const ours = isObject(item.metadata) ? item.metadata[OTIO_METADATA_KEY] : undefined;
	const kindText = isObject(ours) ? ours.kind : undefined;
	const kind = MARKER_KINDS.find((known) => known === kindText) ?? null;
	return { where, frame, kind, name };
}

/**
 * Reads the markers of an OTIO timeline at the episode's rate: those on its stack and on each
 * track (both count from the cut's first frame). A bad item is an error with its path.
 */
export function readOtio(text: string, clock: ProgrammeClock): MarkerRead {
	const markers: ReadMarker[] = [];
	const errors: RowError[] = [];
	let root: unknown;
	try {
		root = JSON.parse(text.replace(/^\uFEFF/, ''));
	} catch {
		errors.push({
			where: '(file)',
			message:
				"This file isn't valid JSON, so it can't be an OpenTimelineIO timeline. Export it again from the edit system."
		});
		return { markers, errors };
	}
	if (!isObject(root) || !schemaOf(root).startsWith('Timeline.')) {
		errors.push({
			where: 'OTIO_SCHEMA',
			message:
				'This JSON is not an OpenTimelineIO timeline (its OTIO_SCHEMA should be "Timeline.1").'
		});
		return { markers, errors };
	}
	const exact = otioRate(clock);
	const take = (list: unknown, path: string) => {
		if (list === undefined || list === null) return;
		if (!Array.isArray(list)) {
			errors.push({ where: path, message: 'This should be a list of markers.' });
			return;
		}
		list.forEach((item, index) => {
			const read = readMarker(item, `${path}[${index}]`, exact);
			if ('message' in read) errors.push(read);
			else markers.push(read);
		});
	};
	const stack = root.tracks;
	if (!isObject(stack) || !schemaOf(stack).startsWith('Stack.')) {
		errors.push({
			where: 'tracks',
			message: 'The timeline has no tracks (a Stack); export the whole timeline.'
		});
		return { markers, errors };
	}
	take(stack.markers, 'tracks.markers');
	if (Array.isArray(stack.children))
		stack.children.forEach((track, index) => {
			if (isObject(track) && schemaOf(track).startsWith('Track.'))
				take(track.markers, `tracks.children[${index}].markers`);
		});
	return { markers, errors };
}
