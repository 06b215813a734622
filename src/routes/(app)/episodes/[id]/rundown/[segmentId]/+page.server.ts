import { error, redirect } from '@sveltejs/kit';
import { requireRole, hasRole } from '$lib/server/auth/guard';
import {
	checkSegmentChangeRoles,
	deleteSegment,
	updateSegment
} from '$lib/server/episodes/segments';
import { assertSegmentOfEpisode } from '$lib/server/episodes/segment-in-channel';
import { segmentView } from '$lib/server/episodes/rundown';
import { updateCaution } from '$lib/server/episodes/cautions';
import { addShot } from '$lib/server/episodes/shots';
import { episodeFormOptions, episodeInChannel } from '$lib/server/episodes/episodes';
import { pickEpisodes } from '$lib/server/episodes/episode-picker';
import {
	EPISODE_PICKER_LIMIT,
	cautionUpdateSchema,
	segmentDeleteSchema,
	segmentUpdateSchema,
	shotCreateSchema
} from '$lib/schemas/episodes';
import { attempt, forPage, runForm, text } from '$lib/server/http/forms';
import { clockOfEpisode } from '$lib/server/episodes/programme-timecode';
import { segmentFormValues } from '../segment-form';
import { shotFormValues } from '../../shot-form';
import { stageLock, type Lockable, type Stage } from '$lib/stages';
import type { Actions, PageServerLoad } from './$types';
import { safeRedirectPath } from '$lib/safe-redirect';

export const load = (async (event) => {
	const { channel } = requireRole(event);
	const { episodeHeader } = await event.parent();
	// The stage's locks take the editing controls away (the layout says why).
	const open = (what: Lockable) => stageLock(episodeHeader.stage as Stage, what) === null;
	const [segment, episode, options, episodes] = await forPage(
		Promise.all([
			segmentView(channel.id, event.params.segmentId),
			episodeInChannel(channel.id, event.params.id),
			episodeFormOptions(channel.id),
			pickEpisodes(channel.id, { except: event.params.id, limit: EPISODE_PICKER_LIMIT })
		])
	);
	if (segment.episodeId !== episode.id) error(404, 'That segment is not in this episode.');
	const programme = clockOfEpisode(episode);
	return {
		segment,
		episode: {
			id: episode.id,
			title: episode.title,
			frameRate: episode.frameRate,
			dropFrame: programme.dropFrame,
			timecodeStart: programme.startLabel,
			/** The cut's length (no start offset), and the label where it ends. */
			cut:
				episode.cutDurationFrames === null
					? null
					: programme.formatLength(episode.cutDurationFrames),
			cutEnd:
				episode.cutDurationFrames === null ? null : programme.format(episode.cutDurationFrames)
		},
		builds: options.builds,
		episodes,
		can: {
			plan: open('rundown') && hasRole(event.locals, 'producer', 'host'),
			word: open('cards') && hasRole(event.locals, 'producer', 'host'),
			place: open('cards') && hasRole(event.locals, 'producer', 'editor'),
			shots: open('shots') && hasRole(event.locals, 'producer', 'camera')
		}
	};
}) satisfies PageServerLoad;

export const actions = {
	save: async (event) => {
		const { channel, roles } = requireRole(event, 'producer', 'host');
		const form = await event.request.formData();
		const owned = await attempt('segment', {}, () =>
			assertSegmentOfEpisode(channel.id, event.params.id, event.params.segmentId)
		);
		if (!owned.ok) return owned.failure;
		const values = { ...segmentFormValues(form), version: text(form, 'version') };
		const result = await runForm('save', segmentUpdateSchema, values, async (data) => {
			checkSegmentChangeRoles(roles, data);
			return updateSegment(channel.id, event.params.segmentId, data);
		});
		if (!result.ok) return result.failure;
		return { action: 'save', saved: true };
	},
	/** The editor (or a producer) types the segment's length in the cut. */
	recorded: async (event) => {
		const { channel, roles } = requireRole(event, 'producer', 'editor');
		const form = await event.request.formData();
		const owned = await attempt('segment', {}, () =>
			assertSegmentOfEpisode(channel.id, event.params.id, event.params.segmentId)
		);
		if (!owned.ok) return owned.failure;
		const values = { recorded: text(form, 'recorded'), version: text(form, 'version') };
		const result = await runForm('recorded', segmentUpdateSchema, values, async (data) => {
			checkSegmentChangeRoles(roles, data);
			return updateSegment(channel.id, event.params.segmentId, data);
		});
		if (!result.ok) return result.failure;
		return { action: 'recorded', saved: true };
	},
	/** Words (host, producer) and/or placement (editor, producer) of one caution card. */
	caution: async (event) => {
		const { channel, person, roles } = requireRole(event, 'producer', 'host', 'editor');
		const form = await event.request.formData();
		const owned = await attempt('segment', {}, () =>
			assertSegmentOfEpisode(channel.id, event.params.id, event.params.segmentId)
		);
		if (!owned.ok) return owned.failure;
		const hazard = text(form, 'hazard');
		const values: Record<string, string> = { version: text(form, 'version') };
		if (form.has('text')) values.text = text(form, 'text');
		if (form.has('at')) values.at = text(form, 'at');
		if (form.has('seconds')) values.seconds = text(form, 'seconds');
		const result = await runForm(
			{ action: 'caution', hazard },
			cautionUpdateSchema,
			values,
			(data) =>
				updateCaution(channel.id, { ...person, roles }, event.params.segmentId, hazard, data)
		);
		if (!result.ok) return result.failure;
		return { action: 'caution', hazard, saved: true };
	},
	addShot: async (event) => {
		const { channel } = requireRole(event, 'producer', 'camera');
		const form = await event.request.formData();
		const owned = await attempt('segment', {}, () =>
			assertSegmentOfEpisode(channel.id, event.params.id, event.params.segmentId)
		);
		if (!owned.ok) return owned.failure;
		const values = shotFormValues(form);
		const result = await runForm('addShot', shotCreateSchema, values, (data) =>
			addShot(channel.id, event.params.segmentId, data)
		);
		if (!result.ok) return result.failure;
		return { action: 'addShot', added: result.value.what };
	},
	delete: async (event) => {
		const { channel } = requireRole(event, 'producer', 'host');
		const form = await event.request.formData();
		const owned = await attempt('segment', {}, () =>
			assertSegmentOfEpisode(channel.id, event.params.id, event.params.segmentId)
		);
		if (!owned.ok) return owned.failure;
		const values = { version: text(form, 'version') };
		const result = await runForm('delete', segmentDeleteSchema, values, (data) =>
			deleteSegment(channel.id, event.params.segmentId, data.version)
		);
		if (!result.ok) return result.failure;
		redirect(303, safeRedirectPath(`/episodes/${event.params.id}/rundown`));
	}
} satisfies Actions;
