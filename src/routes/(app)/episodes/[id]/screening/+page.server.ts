import { redirect } from '@sveltejs/kit';
import { hasRole, requireRole } from '$lib/server/auth/guard';
import { attempt, forPage, runForm, text } from '$lib/server/http/forms';
import { requestEpisode } from '$lib/server/episodes/request-episode';
import {
	answerVersion,
	carryPreview,
	confirmCarryOffset,
	cutVersionsFor,
	setChangeNote
} from '$lib/server/edit/cut-versions';
import {
	addComment,
	answerComment,
	cutCommentsFor,
	mentionableCrew,
	replyToComment
} from '$lib/server/edit/cut-comments';
import {
	approvalSchema,
	carryOffsetSchema,
	commentAnswerSchema,
	commentCreateSchema,
	replySchema,
	versionNoteSchema
} from '$lib/schemas/cut-review';
import { APPROVE_ROLES, COMMENT_ROLES, SETTLE_ROLES, VERSION_ROLES } from '$lib/cut-review';
import { programmeTimecode } from '$lib/timecode';
import { stageLock, type Stage } from '$lib/stages';
import { safeRedirectPath } from '$lib/safe-redirect';
import type { Actions, PageServerLoad } from './$types';

/**
 * Screening: the crew watches a version of the cut at programme timecode and comments at a frame
 * or over a range; the editor answers, confirms a carry-over offset and writes change notes; the
 * producer approves. `?v=<number>` plays an older version, `?beside=<number>` a second one locked
 * to the first, `?offset=` previews a carry-over shift without writing. Every change is a form
 * action, so the page works without JavaScript.
 */
export const load = (async (event) => {
	const { channel, roles } = requireRole(event);
	const id = event.params.id;
	const [episode, versions, comments, crew] = await Promise.all([
		forPage(requestEpisode(event.locals, channel.id, id)),
		cutVersionsFor(channel.id, id),
		cutCommentsFor(channel.id, id),
		mentionableCrew(channel.id)
	]);
	const lock = stageLock(episode.stage as Stage, 'cut');
	const numberParam = (name: string) => Number(event.url.searchParams.get(name) ?? NaN);
	const playing =
		versions.find((version) => version.number === numberParam('v')) ?? versions[0] ?? null;
	const beside = versions.find((version) => version.number === numberParam('beside')) ?? null;
	const offset = event.url.searchParams.get('offset');
	const can = (allowed: readonly Parameters<typeof hasRole>[1][]) =>
		!lock && hasRole(event.locals, ...allowed);
	let preview: Awaited<ReturnType<typeof carryPreview>> | { error: string } | null = null;
	if (offset !== null && versions[0] && can(VERSION_ROLES)) {
		const tried = await attempt('preview', { offset }, () =>
			carryPreview(channel.id, id, versions[0].id, offset)
		);
		preview = tried.ok
			? tried.value
			: { error: Object.values(tried.failure.data.errors).flat()[0] ?? 'Check the shift.' };
	}
	return {
		episode: {
			id: episode.id,
			title: episode.title,
			stage: episode.stage,
			timecode: programmeTimecode(episode)
		},
		versions,
		comments,
		crew: crew.map((member) => ({ id: member.id, name: member.name })),
		playing,
		beside,
		offset,
		preview,
		lock,
		rights: {
			comment: can(COMMENT_ROLES),
			settle: can(SETTLE_ROLES),
			version: can(VERSION_ROLES),
			approve: can(APPROVE_ROLES),
			reply: !lock
		},
		personId: event.locals.person?.id ?? null,
		roles
	};
}) satisfies PageServerLoad;

const back = (event: { url: URL }) =>
	safeRedirectPath(event.url.pathname + event.url.search.replace(/[?&]\/[a-zA-Z]+/, ''));

export const actions = {
	comment: async (event) => {
		const { channel, person } = requireRole(event, ...COMMENT_ROLES);
		const form = await event.request.formData();
		const values = {
			versionId: text(form, 'versionId'),
			at: text(form, 'at'),
			until: text(form, 'until'),
			body: text(form, 'body')
		};
		const result = await runForm('comment', commentCreateSchema, values, (data) =>
			addComment(channel.id, person, event.params.id, data, event.url.origin)
		);
		if (!result.ok) return result.failure;
		return { action: 'comment' as const, mentioned: result.value.mentioned, id: result.value.id };
	},
	reply: async (event) => {
		const { channel, person } = requireRole(event);
		const form = await event.request.formData();
		const commentId = text(form, 'commentId');
		const values = { body: text(form, 'body') };
		const tag = { action: 'reply' as const, commentId };
		const result = await runForm(tag, replySchema, values, (data) =>
			replyToComment(channel.id, person, event.params.id, commentId, data.body, event.url.origin)
		);
		if (!result.ok) return result.failure;
		redirect(303, `${event.url.pathname}#comment-${commentId}`);
	},
	answer: async (event) => {
		const { channel, person, roles } = requireRole(event);
		const form = await event.request.formData();
		const commentId = text(form, 'commentId');
		const values = {
			state: text(form, 'state'),
			reason: text(form, 'reason'),
			version: text(form, 'version')
		};
		const tag = { action: 'answer' as const, commentId };
		const result = await runForm(tag, commentAnswerSchema, values, (data) =>
			answerComment(channel.id, { id: person.id, roles }, event.params.id, commentId, data)
		);
		if (!result.ok) return result.failure;
		redirect(303, `${event.url.pathname}#comment-${commentId}`);
	},
	note: async (event) => {
		const { channel } = requireRole(event, ...VERSION_ROLES);
		const form = await event.request.formData();
		const versionId = text(form, 'versionId');
		const values = { changeNote: text(form, 'changeNote'), version: text(form, 'version') };
		const tag = { action: 'note' as const, versionId };
		const result = await runForm(tag, versionNoteSchema, values, (data) =>
			setChangeNote(channel.id, event.params.id, versionId, data)
		);
		if (!result.ok) return result.failure;
		redirect(303, back(event));
	},
	carry: async (event) => {
		const { channel } = requireRole(event, ...VERSION_ROLES);
		const form = await event.request.formData();
		const versionId = text(form, 'versionId');
		const values = { offset: text(form, 'offset'), version: text(form, 'version') };
		const result = await runForm('carry', carryOffsetSchema, values, (data) =>
			confirmCarryOffset(channel.id, event.params.id, versionId, data)
		);
		if (!result.ok) return result.failure;
		redirect(303, event.url.pathname);
	},
	approve: async (event) => {
		const { channel, person } = requireRole(event, ...APPROVE_ROLES);
		const form = await event.request.formData();
		const versionId = text(form, 'versionId');
		const values = {
			decision: text(form, 'decision'),
			note: text(form, 'note'),
			version: text(form, 'version')
		};
		const result = await runForm('approve', approvalSchema, values, (data) =>
			answerVersion(channel.id, person.id, event.params.id, versionId, data)
		);
		if (!result.ok) return result.failure;
		redirect(303, event.url.pathname);
	}
} satisfies Actions;
