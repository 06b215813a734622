/** Shapes of shoot-day input: shared by the forms, the API and the client. */
import { z } from 'zod';
import { calendarDate, text, recordVersion, wholeNumber } from './fields';

const time = z
	.string({ error: 'Use a 24-hour time like 07:30.' })
	.regex(/^([01]\d|2[0-3]):[0-5]\d$/, 'Use a 24-hour time like 07:30.');
const optionalTime = z
	.union([time, z.literal('')])
	.optional()
	.transform((v) => v || null);
const date = calendarDate('Pick a date.');
const positive = (label: string, max: number) =>
	z.coerce
		.number({ error: `Enter ${label}.` })
		.positive(`${label[0].toUpperCase() + label.slice(1)} must be more than zero.`)
		.max(max, `That is more than ${max}.`);

const readable = (value: unknown) =>
	typeof value === 'string' && /^([01]\d|2[0-3]):[0-5]\d$/.test(value);
/** A cross-field check runs when the fields it compares are readable, whatever else is wrong. */
const timesReadable = (payload: { value: unknown }) => {
	const input = payload.value as { callTime?: unknown; wrapTime?: unknown } | null;
	return readable(input?.callTime) && readable(input?.wrapTime);
};
const bayTimesReadable = (payload: { value: unknown }) => {
	const input = payload.value as { bayFrom?: unknown; bayUntil?: unknown } | null;
	return readable(input?.bayFrom) && readable(input?.bayUntil);
};

export const shootDaySchema = z
	.object({
		episodeId: z.string({ error: 'Pick an episode.' }).uuid('Pick an episode.'),
		shootDate: date,
		locationName: text()
			.trim()
			.min(1, 'Name the shop or location.')
			.max(120, 'Keep the location under 120 characters.'),
		locationAddress: text().trim().max(300, 'Keep the address under 300 characters.').default(''),
		bay: text().trim().max(60, 'Keep the bay under 60 characters.').default(''),
		bayFrom: optionalTime,
		bayUntil: optionalTime,
		callTime: time,
		wrapTime: time,
		notes: text().trim().max(2000, 'Keep the notes under 2,000 characters.').default('')
	})
	// Checked even when another field is wrong too, so every problem shows in one pass.
	.refine((d) => d.wrapTime > d.callTime, {
		path: ['wrapTime'],
		message: 'Make the wrap later than the call time.',
		when: timesReadable
	})
	.refine((d) => !d.bayFrom || !d.bayUntil || d.bayUntil > d.bayFrom, {
		path: ['bayUntil'],
		message: 'Make the bay booking end after it starts.',
		when: bayTimesReadable
	});

export const shootDayUpdateSchema = z
	.object({
		shootDate: date,
		locationName: text()
			.trim()
			.min(1, 'Name the shop or location.')
			.max(120, 'Keep the location under 120 characters.'),
		locationAddress: text().trim().max(300, 'Keep the address under 300 characters.'),
		bay: text().trim().max(60, 'Keep the bay under 60 characters.'),
		bayFrom: optionalTime,
		bayUntil: optionalTime,
		callTime: time,
		wrapTime: time,
		notes: text().trim().max(2000, 'Keep the notes under 2,000 characters.'),
		version: recordVersion
	})
	.refine((d) => d.wrapTime > d.callTime, {
		path: ['wrapTime'],
		message: 'Make the wrap later than the call time.',
		when: timesReadable
	});

export const plannerSchema = z.object({
	programMinutes: positive('the programme minutes', 600),
	shootingRatio: z.coerce
		.number({ error: 'Enter a shooting ratio.' })
		.min(1, 'A shooting ratio is at least 1 (1:1).')
		.max(200, 'That ratio is more than 200:1.'),
	cardSizeGb: positive('the card size', 100000),
	uplinkMbps: positive('the uplink speed', 100000)
});

export const cameraSchema = z.object({
	label: text()
		.trim()
		.min(1, 'Name the camera, e.g. "A cam".')
		.max(40, 'Keep the name under 40 characters.'),
	profileId: z.string().uuid('Pick a recording profile.'),
	rollHours: z
		.union([
			z.literal(''),
			z.coerce.number().positive('Roll hours must be more than zero.').max(24)
		])
		.transform((v) => (v === '' ? null : v))
});

const quantity = wholeNumber({
	error: 'Enter how many.',
	notWhole: 'Use a whole number.',
	coerce: true,
	min: 1,
	max: 999,
	tooSmall: 'At least one.',
	tooBig: 'At most 999.'
});

export const gearSchema = z.object({
	kind: z.enum(['camera', 'audio', 'light', 'grip', 'other'], { error: 'Pick a kind of gear.' }),
	label: text().trim().min(1, 'Say what the gear is.').max(120, 'Keep it under 120 characters.'),
	quantity
});

export const pullItemSchema = z
	.object({
		partId: z.union([z.literal(''), z.string().uuid()]).transform((v) => v || null),
		label: text().trim().max(160, 'Keep it under 160 characters.').default(''),
		quantity
	})
	.refine((d) => d.partId || d.label, {
		path: ['label'],
		message: 'Pick a part from the catalogue or describe the extra.'
	});

export const onHandSchema = z.object({
	onHand: z.boolean({ error: 'onHand is true or false.' }),
	version: recordVersion
});

export const profileSchema = z.object({
	name: text().trim().min(1, 'Name the profile.').max(80, 'Keep the name under 80 characters.'),
	camera: text().trim().min(1, 'Say which camera body.').max(80, 'Keep it under 80 characters.'),
	codec: text().trim().min(1, 'Say which codec.').max(60, 'Keep it under 60 characters.'),
	resolution: text().trim().min(1, 'Say which resolution.').max(40, 'Keep it under 40 characters.'),
	frameRate: z.enum(['23.976', '24', '25', '29.97', '30', '50', '59.94', '60'], {
		error: 'Pick a frame rate.'
	}),
	bitrateMbps: positive('the bitrate', 10000)
});

export const idListSchema = z.array(z.string().uuid()).max(200);
