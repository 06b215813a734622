/**
 * The one way a form action runs (DEVELOPERS.md, "Form actions"):
 *
 *   const values = { title: text(form, 'title'), version: text(form, 'version') };
 *   const result = await runForm('save', schema, values, (data) => saveThing(channel.id, id, data));
 *   if (!result.ok) return result.failure;
 *   redirect(303, …) or return { action: 'save', saved: true };
 *
 * A field the schema refuses answers `fail(400, { action, errors, values })`; a refusal from the
 * domain (a DomainError: 404, 409 with `extra.current`, 413 …) or a 403/404 from a rule about who may
 * do what answers `fail(status, { action, errors: { form: [why] }, values, extra })`. Either way the
 * page shows the message beside the form named by `action` and keeps what the person typed.
 *
 * Page loads run their reads inside `forPage`, the one "not found" path: a DomainError becomes the
 * error page with its status and words.
 */
import { error, fail, isHttpError, type ActionFailure } from '@sveltejs/kit';
import { z } from 'zod';
import { DomainError, fieldIssues } from './api';
import { versionOnlySchema } from '$lib/schemas/fields';

export type FormErrors = Record<string, string[]>;

/** Names the form that failed: its action, plus any id the page needs to find it (`{ action, chapterId }`). */
export type FormTag = { action: string } & Record<string, unknown>;
type TagOf<G> = G extends string ? { action: G } : G;

/** What a failed action hands the page. */
export type FormProblem<G, V> = TagOf<G> & {
	errors: FormErrors;
	values: V;
	extra?: Record<string, unknown>;
};

export type Attempted<T, G, V> =
	{ ok: true; value: T } | { ok: false; failure: ActionFailure<FormProblem<G, V>> };

const tagOf = <G extends string | FormTag>(tag: G) =>
	(typeof tag === 'string' ? { action: tag } : tag) as TagOf<G>;

/** Checks values with a zod schema: the typed data, or the field errors. */
export function parseForm<T extends z.ZodType>(
	schema: T,
	values: unknown
): { ok: true; data: z.infer<T> } | { ok: false; errors: FormErrors } {
	const parsed = schema.safeParse(values);
	return parsed.success
		? { ok: true, data: parsed.data }
		: { ok: false, errors: fieldIssues(parsed.error) };
}

/** A field-error failure (400) for the form named by `tag`. */
export const invalid = <const G extends string | FormTag, V>(
	tag: G,
	errors: FormErrors,
	values: V
) => fail(400, { ...tagOf(tag), errors, values } as FormProblem<G, V>);

/** Runs a domain call; its refusal becomes a failure that keeps what the person typed. */
export async function attempt<T, const G extends string | FormTag, V>(
	tag: G,
	values: V,
	work: () => Promise<T>
): Promise<Attempted<T, G, V>> {
	try {
		return { ok: true, value: await work() };
	} catch (failure) {
		if (failure instanceof DomainError) {
			const problem = {
				...tagOf(tag),
				errors: failure.issues ?? { form: [failure.message] },
				values,
				...(failure.extra ? { extra: failure.extra } : {})
			} as FormProblem<G, V>;
			return { ok: false, failure: fail(failure.status, problem) };
		}
		if (isHttpError(failure) && (failure.status === 403 || failure.status === 404)) {
			const problem = {
				...tagOf(tag),
				errors: { form: [failure.body.message] } as FormErrors,
				values
			} as FormProblem<G, V>;
			return { ok: false, failure: fail(failure.status, problem) };
		}
		throw failure;
	}
}

/** Checks `values` with `schema`, then runs the domain call with the typed data. */
export async function runForm<T, const G extends string | FormTag, S extends z.ZodType, V>(
	tag: G,
	schema: S,
	values: V,
	work: (data: z.infer<S>) => Promise<T>
): Promise<Attempted<T, G, V>> {
	const parsed = parseForm(schema, values);
	if (!parsed.ok) return { ok: false, failure: invalid(tag, parsed.errors, values) };
	return attempt(tag, values, () => work(parsed.data));
}

/** A form field as text ('' when it is missing). */
export const text = (form: FormData, name: string) => String(form.get(name) ?? '');

/** Every field of a form as text; a name sent more than once (checkboxes) as a list. */
export function formFields(form: FormData): Record<string, string | string[]> {
	return Object.fromEntries(
		[...new Set(form.keys())].map((key) => {
			const all = form.getAll(key).map(String);
			return [key, all.length > 1 ? all : all[0]];
		})
	);
}

/** The `version` a form carries for its optimistic lock (a whole number from 1), or the field error. */
export function readVersion(
	form: FormData
): { ok: true; version: number } | { ok: false; errors: FormErrors } {
	const parsed = parseForm(versionOnlySchema, { version: form.get('version') ?? undefined });
	return parsed.ok ? { ok: true, version: parsed.data.version } : parsed;
}

/** For page loads: a DomainError (404, 409 …) becomes SvelteKit's error page with the same status and words. */
export async function forPage<T>(work: Promise<T> | (() => Promise<T>)): Promise<T> {
	try {
		return await (typeof work === 'function' ? work() : work);
	} catch (failure) {
		if (failure instanceof DomainError) error(failure.status, failure.message);
		throw failure;
	}
}
