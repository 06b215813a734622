import { redirect } from '@sveltejs/kit';
import { requireRole } from '$lib/server/auth/guard';
import { attempt, forPage, runForm, text } from '$lib/server/http/forms';
import { assertInEpisode } from '$lib/server/http/ownership';
import { createNote, deleteNote, noteRightsFor, updateNote } from '$lib/server/merch/notes';
import { cursorBeforeNote, notesPageFor } from '$lib/server/merch/notes-page';
import { partIdBySku } from '$lib/server/merch/parts';
import { takeOfTypedClip } from '$lib/server/merch/notes-placement';
import { noteCreateFormSchema, noteUpdateFormSchema } from '$lib/schemas/parts';
import { versionOnlySchema } from '$lib/schemas/fields';
import { stageLock, type Stage } from '$lib/stages';
import type { Actions, PageServerLoad } from './$types';
import { safeRedirectPath } from '$lib/safe-redirect';
import { fieldIssues } from '$lib/server/http/api';
import { pageQuerySchema } from '$lib/schemas/paging';

/**
 * Segment notes. Every crew member reads; the camera operator writes notes, the editor places
 * their program time, the merch team links parts (and may start a note), the producer may do all. With JavaScript the
 * part picker searches /api/parts and the take picker /api/episodes/[id]/takes/picker as you type;
 * without it both are text fields (a SKU, a clip name) read here. Every change is a form action.
 */
export const load = (async (event) => {
	const { channel, roles } = requireRole(event);
	// The stage's lock takes every editing control away (the layout says why).
	const open = stageLock((await event.parent()).episodeHeader.stage as Stage, 'notes') === null;
	// One page of notes; "More notes" links to the page after the last one shown (`after`).
	const parsed = pageQuerySchema.safeParse(
		Object.fromEntries([...event.url.searchParams].filter(([, value]) => value !== ''))
	);
	const page = parsed.success ? parsed.data : pageQuerySchema.parse({});
	return {
		...(await forPage(() => notesPageFor(channel.id, event.params.id, page))),
		after: Boolean(page.after),
		pageErrors: parsed.success ? null : fieldIssues(parsed.error),
		rights: noteRightsFor(open ? roles : [])
	};
}) satisfies PageServerLoad;

/** A note's fields are read trimmed. */
const field = (form: FormData, name: string) => text(form, name).trim();
/** '' from an empty field means "none" (null) for the optional fields of a note. */
const orNull = (value: string) => (value === '' ? null : value);
/** The take picker's text (a clip name), when the form has the picker. */
const takeClipOf = (form: FormData) =>
	form.has('takeClip') ? { takeClip: field(form, 'takeClip') } : {};
const actorOf = (caller: ReturnType<typeof requireRole>) => ({
	id: caller.person.id,
	name: caller.person.name,
	roles: caller.roles
});

async function change<const Action extends string>(
	event: Parameters<Actions[string]>[0],
	action: Action,
	roles: Parameters<typeof requireRole>[1][],
	build: (form: FormData, channelId: string) => Promise<Record<string, unknown>>
) {
	const caller = requireRole(event, ...roles);
	const form = await event.request.formData();
	const noteId = field(form, 'noteId');
	const tag = { action, noteId };
	const built = await attempt(tag, {}, () => build(form, caller.channel.id));
	if (!built.ok) return built.failure;
	const values: Record<string, unknown> = { version: field(form, 'version'), ...built.value };
	const result = await runForm(tag, noteUpdateFormSchema, values, async (typed) => {
		await assertInEpisode(caller.channel.id, event.params.id, 'note', noteId);
		const { takeClip, ...data } = typed;
		const takeId = await takeOfTypedClip(caller.channel.id, event.params.id, {
			takeClip,
			takeId: data.takeId,
			segmentId: form.has('takeSegmentId') ? orNull(field(form, 'takeSegmentId')) : null
		});
		return updateNote(caller.channel.id, actorOf(caller), noteId, { ...data, takeId });
	});
	if (!result.ok) return result.failure;
	return { action, noteId, saved: true };
}

export const actions = {
	create: async (event) => {
		const caller = requireRole(event, 'camera', 'merch', 'producer');
		const form = await event.request.formData();
		const values = {
			text: field(form, 'text'),
			segmentId: orNull(field(form, 'segmentId')),
			takeId: orNull(field(form, 'takeId')),
			...takeClipOf(form),
			sourceTime: orNull(field(form, 'sourceTime')),
			// Only the editor's and the producer's forms carry a program time.
			...(form.has('programTime') && field(form, 'programTime') !== ''
				? { programTime: field(form, 'programTime') }
				: {})
		};
		const result = await runForm('create', noteCreateFormSchema, values, async (typed) => {
			const { takeClip, ...data } = typed;
			const takeId = await takeOfTypedClip(caller.channel.id, event.params.id, {
				takeClip,
				takeId: data.takeId,
				segmentId: data.segmentId
			});
			return createNote(caller.channel.id, actorOf(caller), event.params.id, { ...data, takeId });
		});
		if (!result.ok) return result.failure;
		// The page of notes that starts with the new one, wherever it sorts in a long list.
		const after = await cursorBeforeNote(caller.channel.id, event.params.id, result.value.id);
		const page = after ? `?after=${encodeURIComponent(after)}` : '';
		redirect(303, safeRedirectPath(`${event.url.pathname}${page}#note-${result.value.id}`));
	},
	place: (event) =>
		change(event, 'place', ['editor', 'producer'], async (form) => ({
			programTime: orNull(field(form, 'programTime'))
		})),
	write: (event) =>
		change(event, 'write', ['camera', 'producer'], async (form) => ({
			text: field(form, 'text'),
			takeId: orNull(field(form, 'takeId')),
			...takeClipOf(form),
			sourceTime: orNull(field(form, 'sourceTime'))
		})),
	link: (event) =>
		change(event, 'link', ['merch', 'producer'], async (form, channelId) => {
			const current = form.getAll('partIds').map(String);
			// Without JavaScript the picker is a plain SKU field; with it, the picked part's id.
			const added = field(form, 'partId') || (await partIdBySku(channelId, field(form, 'sku')));
			return { partIds: [...new Set([...current, added])] };
		}),
	unlink: (event) =>
		change(event, 'unlink', ['merch', 'producer'], async (form) => {
			const removed = field(form, 'partId');
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
		const noteId = field(form, 'noteId');
		const values = { version: field(form, 'version') };
		const tag = { action: 'remove' as const, noteId };
		const result = await runForm(tag, versionOnlySchema, values, async ({ version }) => {
			await assertInEpisode(caller.channel.id, event.params.id, 'note', noteId);
			return deleteNote(caller.channel.id, actorOf(caller), noteId, version);
		});
		if (!result.ok) return result.failure;
		return { action: 'remove' as const, noteId, saved: true };
	}
} satisfies Actions;
