import { fail, redirect } from '@sveltejs/kit';
import { DomainError } from '$lib/server/http/api';
import { requireRole } from '$lib/server/auth/guard';
import { attempt, forPage, parseForm, readVersion } from '$lib/server/http/forms';
import { assertInEpisode } from '$lib/server/http/ownership';
import { createNote, deleteNote, noteRightsFor, updateNote } from '$lib/server/merch/notes';
import { notesPageFor } from '$lib/server/merch/notes-page';
import { partIdBySku } from '$lib/server/merch/parts';
import { noteCreateSchema, noteUpdateSchema } from '$lib/schemas/parts';
import type { Actions, PageServerLoad } from './$types';
import { safeRedirectPath } from '$lib/safe-redirect';

/**
 * Segment notes. Every crew member reads; the camera operator writes notes, the editor places
 * their program time, the merch team links parts (and may start a note), the producer may do all. With JavaScript the
 * part picker searches /api/parts as you type; every change is a form action underneath.
 */
export const load = (async (event) => {
	const { channel, roles } = requireRole(event);
	return {
		...(await forPage(() => notesPageFor(channel.id, event.params.id))),
		rights: noteRightsFor(roles)
	};
}) satisfies PageServerLoad;

const text = (form: FormData, name: string) => String(form.get(name) ?? '').trim();
/** '' from an empty field means "none" (null) for the optional fields of a note. */
const orNull = (value: string) => (value === '' ? null : value);
const version = (form: FormData) => Number(form.get('version') ?? Number.NaN);
const actorOf = (caller: ReturnType<typeof requireRole>) => ({
	id: caller.person.id,
	name: caller.person.name,
	roles: caller.roles
});

async function change<Action extends string>(
	event: Parameters<Actions[string]>[0],
	action: Action,
	roles: Parameters<typeof requireRole>[1][],
	build: (form: FormData, channelId: string) => Promise<Record<string, unknown>>
) {
	const caller = requireRole(event, ...roles);
	const form = await event.request.formData();
	const noteId = text(form, 'noteId');
	let values: Record<string, unknown>;
	try {
		values = { version: version(form), ...(await build(form, caller.channel.id)) };
	} catch (failure) {
		if (failure instanceof DomainError)
			return fail(failure.status, {
				action,
				noteId,
				errors: failure.issues ?? { form: [failure.message] },
				values: {}
			});
		throw failure;
	}
	const parsed = parseForm(noteUpdateSchema, values);
	if (!parsed.ok) return fail(400, { action, noteId, errors: parsed.errors, values });
	const result = await attempt(values, async () => {
		await assertInEpisode(caller.channel.id, event.params.id, 'note', noteId);
		return updateNote(caller.channel.id, actorOf(caller), noteId, parsed.data);
	});
	if ('status' in result) return fail(result.status, { action, noteId, ...result.data });
	return { action, noteId, saved: true };
}

export const actions = {
	create: async (event) => {
		const caller = requireRole(event, 'camera', 'merch', 'producer');
		const form = await event.request.formData();
		const values = {
			text: text(form, 'text'),
			segmentId: orNull(text(form, 'segmentId')),
			takeId: orNull(text(form, 'takeId')),
			sourceTime: orNull(text(form, 'sourceTime')),
			// Only the editor's and the producer's forms carry a program time.
			...(form.has('programTime') && text(form, 'programTime') !== ''
				? { programTime: text(form, 'programTime') }
				: {})
		};
		const parsed = parseForm(noteCreateSchema, values);
		if (!parsed.ok) return fail(400, { action: 'create' as const, errors: parsed.errors, values });
		const result = await attempt(values, () =>
			createNote(caller.channel.id, actorOf(caller), event.params.id, parsed.data)
		);
		if ('status' in result)
			return fail(result.status, { action: 'create' as const, ...result.data });
		redirect(303, safeRedirectPath(`${event.url.pathname}#note-${result.id}`));
	},
	place: (event) =>
		change(event, 'place', ['editor', 'producer'], async (form) => ({
			programTime: orNull(text(form, 'programTime'))
		})),
	write: (event) =>
		change(event, 'write', ['camera', 'producer'], async (form) => ({
			text: text(form, 'text'),
			takeId: orNull(text(form, 'takeId')),
			sourceTime: orNull(text(form, 'sourceTime'))
		})),
	link: (event) =>
		change(event, 'link', ['merch', 'producer'], async (form, channelId) => {
			const current = form.getAll('partIds').map(String);
			// Without JavaScript the picker is a plain SKU field; with it, the picked part's id.
			const added = text(form, 'partId') || (await partIdBySku(channelId, text(form, 'sku')));
			return { partIds: [...new Set([...current, added])] };
		}),
	unlink: (event) =>
		change(event, 'unlink', ['merch', 'producer'], async (form) => {
			const removed = text(form, 'partId');
			return {
				partIds: form
					.getAll('partIds')
					.map(String)
					.filter((id) => id !== removed)
			};
		}),
	remove: async (event) => {
		const caller = requireRole(event, 'camera', 'producer');
		const form = await event.request.formData();
		const noteId = text(form, 'noteId');
		const read = readVersion(form);
		if (!read.ok)
			return fail(400, { action: 'remove' as const, noteId, errors: read.errors, values: {} });
		const result = await attempt({}, async () => {
			await assertInEpisode(caller.channel.id, event.params.id, 'note', noteId);
			return deleteNote(caller.channel.id, actorOf(caller), noteId, read.version);
		});
		if ('status' in result)
			return fail(result.status, { action: 'remove' as const, noteId, ...result.data });
		return { action: 'remove' as const, noteId, saved: true };
	}
} satisfies Actions;
