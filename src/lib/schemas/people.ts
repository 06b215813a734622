/** Shapes of what people type about themselves, the crew and the channel: shared by forms and the API. */
import { z } from 'zod';

import { ROLES } from '$lib/roles';
import { text, recordVersion, wholeNumber } from './fields';

export const roleSchema = z.enum(ROLES, {
	error: 'Pick one of: producer, host, camera, editor, merch.'
});

const email = text('Enter an e-mail address.')
	.trim()
	.min(1, 'Enter an e-mail address.')
	.max(254, 'That e-mail address is too long.')
	.pipe(z.email({ error: 'That does not look like an e-mail address.' }));

const personName = text('Enter a name.')
	.trim()
	.min(1, 'Enter a name.')
	.max(80, 'Keep the name under 80 characters.');

// Passwords are only ever hashed, never stored as text: every character counts as typed.
export const signInSchema = z.object({
	email,
	password: z
		.string({ error: 'Enter your password.' })
		.min(1, 'Enter your password.')
		.max(1024, 'That password is too long.')
});

export const inviteSchema = z.object({
	email,
	name: personName,
	roles: z.array(roleSchema).min(1, 'Give the person at least one role.').max(5)
});

export const rolesUpdateSchema = z.object({
	roles: z
		.array(roleSchema)
		.min(1, 'Keep at least one role; disable the account to remove access.')
		.max(5)
});

export const crewUpdateSchema = z
	.object({
		roles: z
			.array(roleSchema)
			.min(1, 'Keep at least one role; disable the account to remove access.')
			.max(5)
			.optional(),
		disabled: z.boolean({ error: 'disabled is true or false.' }).optional()
	})
	.strict();

export const setPasswordSchema = z
	.object({
		password: z.string({ error: 'Choose a password.' }).max(1024, 'That password is too long.'),
		confirm: z.string({ error: 'Type the password again.' })
	})
	.refine((value) => value.password === value.confirm, {
		path: ['confirm'],
		message: 'The two passwords differ.'
	});

export const forgotSchema = z.object({ email });

/** Account: the name the crew sees. */
export const renameSchema = z.object({ name: personName });

/** Account: a new password, with the current one first (rules in server/auth/passwords.ts). */
export const passwordChangeSchema = z
	.object({
		currentPassword: z
			.string({ error: 'Enter your current password.' })
			.min(1, 'Enter your current password.')
			.max(1024, 'That password is too long.'),
		password: z.string({ error: 'Choose a password.' }).max(1024, 'That password is too long.'),
		confirm: z.string({ error: 'Type the new password again.' })
	})
	.refine((value) => value.password === value.confirm, {
		path: ['confirm'],
		message: 'The two new passwords differ.'
	});

import { DISCLOSURE_MAX, FRAME_RATE_VALUES } from './people-constants';
export { DISCLOSURE_MAX, FRAME_RATE_VALUES };

export const channelSettingsSchema = z.object({
	name: text()
		.trim()
		.min(1, 'Give the channel a name.')
		.max(80, 'Keep the name under 80 characters.'),
	frameRate: z.enum(FRAME_RATE_VALUES, { error: 'Pick one of the listed frame rates.' }),
	callToAction: text().trim().max(1000, 'Keep the call to action under 1,000 characters.'),
	contact: text().trim().max(500, 'Keep the contact details under 500 characters.'),
	/** Said beside the tracked links; left out (an older page or client), the channel keeps its text. */
	disclosure: text()
		.trim()
		.max(
			DISCLOSURE_MAX,
			`Keep the disclosure under ${DISCLOSURE_MAX} characters: one or two plain sentences.`
		)
		.optional(),
	descriptionLimit: wholeNumber({
		error: 'Enter a number of characters.',
		notWhole: 'Use a whole number.',
		coerce: true,
		min: 500,
		max: 20000,
		tooSmall: 'At least 500 characters.',
		tooBig: 'At most 20,000 characters.'
	}),
	/** Whole decimal gigabytes; left out, the channel keeps its quota. */
	storageQuotaGb: wholeNumber({
		error: 'Enter a number of gigabytes, e.g. 2000 for 2 TB.',
		notWhole: 'Use a whole number of gigabytes.',
		coerce: true,
		min: 1,
		max: 1_000_000,
		tooSmall: 'At least 1 GB.',
		tooBig: 'At most 1,000,000 GB (1 PB).'
	}).optional(),
	version: recordVersion
});

export const tokenCreateSchema = z.object({
	label: text('Name the token.')
		.trim()
		.min(1, 'Name the token, e.g. "graphics laptop".')
		.max(60, 'Keep the name under 60 characters.')
});
