/**
 * A CMX 3600 edit decision list carrying markers: each marker is a one-event cut on the record
 * timeline (source and record timecode the same), with a locator comment line beneath it naming
 * the marker's kind and name, and a note line when it has one. Timecode is the episode's
 * programme timecode (its rate, drop-frame or not, and its start label), SMPTE ST 12-1.
 *
 * Layout (CMX 3600; the column widths from memory of the format's description and common
 * practice, see tests/REFERENCES.md): `TITLE:` and `FCM: DROP FRAME` / `FCM: NON-DROP FRAME`
 * header lines; event lines of event number (3 digits), reel (8 columns), track (5), transition
 * (4), transition length (3), then source in, source out, record in, record out; comment lines
 * start with `*`. The locator line is `* LOC: <timecode> <KIND> <name>`; other systems write a
 * colour word where we write the kind, so on reading any word we don't know is read as a chapter.
 */
import { TimecodeError, type ProgrammeClock } from '$lib/timecode';
import {
	IMPORTED_NAME_LIMIT,
	MARKER_KIND_WORDS,
	inMarkerOrder,
	kindOfWord,
	oneLine,
	type Marker,
	type MarkerRead,
	type ReadMarker,
	type RowError
} from './markers';

/** The reel name of a marker event: "AX", an auxiliary source (common practice for events with no tape). */
export const MARKER_REEL = 'AX';

/** The longest title line we write (CMX 3600 lists keep it short; 70 characters, from memory). */
const TITLE_LIMIT = 70;

/** One event line in CMX 3600 columns. */
export function edlEventLine(
	number: number,
	timecodes: { sourceIn: string; sourceOut: string; recordIn: string; recordOut: string },
	reel = MARKER_REEL,
	track = 'V',
	transition = 'C'
): string {
	const { sourceIn, sourceOut, recordIn, recordOut } = timecodes;
	const number3 = String(number).padStart(3, '0');
	// The transition-length column stays blank for a cut.
	return `${number3}  ${reel.padEnd(8)} ${track.padEnd(5)} ${transition.padEnd(4)}     ${sourceIn} ${sourceOut} ${recordIn} ${recordOut}`;
}

/** The markers as a CMX 3600 EDL at the clock's rate, form and start label. */
export function writeEdl(markers: readonly Marker[], title: string, clock: ProgrammeClock): string {
	const lines = [
		`TITLE: ${oneLine(title).slice(0, TITLE_LIMIT) || 'Markers'}`,
		`FCM: ${clock.dropFrame ? 'DROP FRAME' : 'NON-DROP FRAME'}`
	];
	inMarkerOrder(markers).forEach((marker, index) => {
		const recordIn = clock.format(marker.frame);
		const recordOut = clock.format(marker.frame + Math.max(1, marker.durationFrames));
		lines.push(
			'',
			edlEventLine(index + 1, { sourceIn: recordIn, sourceOut: recordOut, recordIn, recordOut }),
			`* LOC: ${recordIn} ${MARKER_KIND_WORDS[marker.kind]} ${oneLine(marker.name)}`
		);
		const note = oneLine(marker.note);
		if (note) lines.push(`* NOTE: ${note}`);
	});
	return lines.join('\n') + '\n';
}

const EVENT_START = /^\d{3,}\s/;
const TC = String.raw`\d{2}:\d{2}:\d{2}[:;]\d{2}`;
const EVENT_LINE = new RegExp(
	String.raw`^(\d{3,})\s+(\S+)\s+(\S+)\s+(\S+)(?:\s+(\d{1,3}))?\s+(${TC})\s+(${TC})\s+(${TC})\s+(${TC})\s*$`
);
const LOCATOR = /^\*\s*LOC:\s*(\S+)(?:\s+(\S+))?(?:\s+(.*))?$/i;
const TIMECODE = /^\d{2}:\d{2}:\d{2}[:;]\d{2}$/;

/**
 * Reads the locators of an EDL at the episode's programme clock: every `* LOC:` line becomes a
 * marker; a line that should be read and can't be is an error with its line number.
 */
export function readEdl(text: string, clock: ProgrammeClock): MarkerRead {
	const markers: ReadMarker[] = [];
	const errors: RowError[] = [];
	let recognised = false;
	const lines = text.replace(/^\uFEFF/, '').split(/\r\n|\r|\n/);
	lines.forEach((raw, index) => {
		const where = `line ${index + 1}`;
		const line = raw.trim();
		if (line === '') return;
		if (/^TITLE:/i.test(line)) {
			recognised = true;
			return;
		}
		if (/^FCM:/i.test(line)) {
			recognised = true;
			const mode = line.slice(4).trim().toUpperCase();
			const drop = mode === 'DROP FRAME' ? true : mode === 'NON-DROP FRAME' ? false : null;
			if (drop === null) {
				errors.push({
					where,
					message: `“${line}” should read FCM: DROP FRAME or FCM: NON-DROP FRAME.`
				});
			} else if (drop !== clock.dropFrame) {
				errors.push({
					where,
					message: `This list counts ${drop ? 'drop-frame' : 'non-drop'} timecode, but the episode counts ${clock.dropFrame ? 'drop-frame' : 'non-drop'} at ${clock.rate} fps. Export the markers again with the episode's timecode, or change the episode's setting first.`
				});
			}
			return;
		}
		if (EVENT_START.test(line)) {
			recognised = true;
			if (!EVENT_LINE.test(line)) {
				errors.push({
					where,
					message:
						'This event line is not laid out as an EDL event: number, reel, track, transition, then four timecodes (source in and out, record in and out).'
				});
			}
			return;
		}
		if (!line.startsWith('*')) return; // split, audio and other edit-system lines carry no markers
		const locator = LOCATOR.exec(line);
		if (!locator) return; // other comment lines (notes, clip names)
		recognised = true;
		const [, timecode, word = '', rest = ''] = locator;
		if (!TIMECODE.test(timecode)) {
			errors.push({
				where,
				message: `“${timecode}” isn't a timecode; a locator line reads * LOC: HH:MM:SS:FF, a word, then the marker's name.`
			});
			return;
		}
		let frame: number;
		try {
			frame = clock.parse(timecode);
		} catch (failure) {
			if (!(failure instanceof TimecodeError)) throw failure;
			errors.push({ where, message: failure.message });
			return;
		}
		const kind = kindOfWord(word);
		// A word that is not ours (another system's colour) belongs to the name only when no name follows.
		const name = oneLine(kind ? rest : rest || word);
		if (name === '') {
			errors.push({ where, message: 'This locator has no name; give the marker a name.' });
			return;
		}
		if (name.length > IMPORTED_NAME_LIMIT) {
			errors.push({
				where,
				message: `This marker's name runs ${name.length} characters; keep it under ${IMPORTED_NAME_LIMIT}.`
			});
			return;
		}
		markers.push({ where, frame, kind, name });
	});
	if (!recognised)
		errors.push({
			where: 'line 1',
			message:
				"This file doesn't read as an EDL: it has no TITLE, FCM, event or locator lines. Export an EDL (CMX 3600) with markers from the edit system and upload that."
		});
	return { markers, errors };
}
