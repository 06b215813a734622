/** Shapes of what people type about themselves, the crew and the channel: shared by forms and the API. */
import { z } from 'zod';

import { ROLES } from '$lib/roles';

export const roleSchema = z.enum(ROLES, {
	error: 'Pick one of: producer, host, camera, editor, merch.'
});

const email = z
	.string({ error: 'Enter an e-mail address.' })
	.trim()
	.min(1, 'Enter an e-mail address.')
	.max(254, 'That e-mail address is too long.')
	.pipe(z.email({ error: 'That does not look like an e-mail address.' }));

const personName = z
	.string({ error: 'Enter a name.' })
	.trim()
	.min(1, 'Enter a name.')
	.max(80, 'Keep the name under 80 characters.');

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

export const FRAME_RATE_VALUES = [
	'23.976',
	'24',
	'25',
	'29.97',
	'30',
	'50',
	'59.94',
	'60'
] as const;

export const channelSettingsSchema = z.object({
	name: z
		.string()
		.trim()
		.min(1, 'Give the channel a name.')
		.max(80, 'Keep the name under 80 characters.'),
	frameRate: z.enum(FRAME_RATE_VALUES, { error: 'Pick one of the listed frame rates.' }),
	callToAction: z.string().trim().max(1000, 'Keep the call to action under 1,000 characters.'),
	contact: z.string().trim().max(500, 'Keep the contact details under 500 characters.'),
	descriptionLimit: z.coerce
		.number({ error: 'Enter a number of characters.' })
		.int('Use a whole number.')
		.min(500, 'At least 500 characters.')
		.max(20000, 'At most 20,000 characters.'),
	/** Whole decimal gigabytes; left out, the channel keeps its quota. */
	storageQuotaGb: z.coerce
		.number({ error: 'Enter a number of gigabytes, e.g. 2000 for 2 TB.' })
		.int('Use a whole number of gigabytes.')
		.min(1, 'At least 1 GB.')
		.max(1_000_000, 'At most 1,000,000 GB (1 PB).')
		.optional(),
	version: z.coerce.number().int().min(1)
});

export const tokenCreateSchema = z.object({
	label: z
		.string({ error: 'Name the token.' })
		.trim()
		.min(1, 'Name the token, e.g. "graphics laptop".')
		.max(60, 'Keep the name under 60 characters.')
});
