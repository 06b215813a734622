import { redirect } from '@sveltejs/kit';
import { hasRole, requireRole } from '$lib/server/auth/guard';
import {
	attempt,
	forPage,
	invalid,
	parseForm,
	readVersion,
	type FormErrors
} from '$lib/server/http/forms';
import {
	createSpecCard,
	deleteSpecCard,
	specCardsFor,
	updateSpecCard
} from '$lib/server/edit/spec-cards';
import {
	specCardCreateSchema,
	specCardInputFromForm,
	specCardUpdateSchema
} from '$lib/schemas/spec-cards';
import { stageLock, type Stage } from '$lib/stages';
import type { Actions, PageServerLoad } from './$types';
import { safeRedirectPath } from '$lib/safe-redirect';

/**
 * The episode's spec cards. Every crew member may look; the editor and the producer add, change,
 * place and remove them. The page previews a card live in the browser with the same pure modules;
 * these actions are what saves it, with or without JavaScript.
 */
export const load = (async (event) => {
	const { channel } = requireRole(event);
	// The stage's lock takes the editing controls away (the layout says why).
	const open = stageLock((await event.parent()).episodeHeader.stage as Stage, 'cards') === null;
	const board = await forPage(() => specCardsFor(channel.id, event.params.id));
	const editId = event.url.searchParams.get('edit');
	return {
		board,
		editing: board.cards.find((card) => card.id === editId) ?? null,
		canEdit: open && hasRole(event.locals, 'editor', 'producer')
	};
}) satisfies PageServerLoad;

/** Every field of the form as text, so a failed save gives back exactly what was typed. */
const formValues = (form: FormData): Record<string, string> =>
	Object.fromEntries(
		[...form.entries()].filter((entry): entry is [string, string] => typeof entry[1] === 'string')
	);

/** Issues on the card's input are keyed "input.from"; the form's fields are named "from". */
const formErrors = (errors: FormErrors): FormErrors =>
	Object.fromEntries(
		Object.entries(errors).map(([key, messages]) => [key.replace(/^input\./, ''), messages])
	);

function typedSeconds(text: string | undefined): number | undefined {
	const trimmed = (text ?? '').trim();
	return trimmed === '' ? undefined : Number(trimmed.replace(',', '.'));
}

/** The save request a form describes, in the shape the API takes. */
function requestFrom(values: Record<string, string>) {
	return {
		input: specCardInputFromForm(values),
		segmentId: values.segmentId ? values.segmentId : null,
		at: values.at?.trim() ? values.at.trim() : null,
		durationSeconds: typedSeconds(values.durationSeconds)
	};
}

const cardsPage = (episodeId: string, cardId?: string) =>
	safeRedirectPath(`/episodes/${episodeId}/spec-cards${cardId ? `#card-${cardId}` : ''}`);

/** The card's own errors are keyed as the form's fields are (see formErrors). */
function withFieldNames<F extends { data: { errors: FormErrors } }>(failure: F): F {
	failure.data.errors = formErrors(failure.data.errors);
	return failure;
}

export const actions = {
	/** Adds a card, or saves one being changed (the form carries its id and the version it read). */
	save: async (event) => {
		const { channel, person } = requireRole(event, 'editor', 'producer');
		const values = formValues(await event.request.formData());
		const cardId = values.cardId ?? '';
		const request = requestFrom(values);
		if (cardId === '') {
			const parsed = parseForm(specCardCreateSchema, request);
			if (!parsed.ok) return invalid('save', formErrors(parsed.errors), values);
			const result = await attempt('save', values, () =>
				createSpecCard(channel.id, person, event.params.id, parsed.data)
			);
			if (!result.ok) return withFieldNames(result.failure);
			redirect(303, cardsPage(event.params.id, result.value.id));
		}
		const parsed = parseForm(specCardUpdateSchema, { ...request, version: values.version });
		if (!parsed.ok) return invalid('save', formErrors(parsed.errors), values);
		const result = await attempt('save', values, () =>
			updateSpecCard(channel.id, event.params.id, cardId, parsed.data)
		);
		if (!result.ok) return withFieldNames(result.failure);
		redirect(303, cardsPage(event.params.id, result.value.id));
	},
	/** Removes a card, if nobody changed it since the page was loaded. */
	remove: async (event) => {
		const { channel } = requireRole(event, 'editor', 'producer');
		const form = await event.request.formData();
		const values = formValues(form);
		const tag = { action: 'remove' as const, cardId: values.cardId };
		const read = readVersion(form);
		if (!read.ok)
			return invalid(
				tag,
				{ form: read.errors.version ?? ['Reload the page and try again.'] },
				values
			);
		const result = await attempt(tag, values, () =>
			deleteSpecCard(channel.id, event.params.id, values.cardId ?? '', read.version)
		);
		if (!result.ok) return result.failure;
		redirect(303, cardsPage(event.params.id));
	}
} satisfies Actions;
