/** Small helpers for form actions: validate FormData with zod and turn domain errors into fail(). */
import { error, fail, type ActionFailure } from '@sveltejs/kit';
import { z } from 'zod';
import { DomainError, fieldIssues } from './api';
import { versionNumber } from '$lib/schemas/fields';

export type FormErrors = Record<string, string[]>;
/** What a failed `attempt` hands the page: the errors, the typed values, and the domain's extra (e.g. `current`). */
export type FormFailure<V> = { errors: FormErrors; values: V; extra?: Record<string, unknown> };

export function parseForm<T extends z.ZodType>(
	schema: T,
	values: unknown
): { ok: true; data: z.infer<T> } | { ok: false; errors: FormErrors } {
	const parsed = schema.safeParse(values);
	return parsed.success
		? { ok: true, data: parsed.data }
		: { ok: false, errors: fieldIssues(parsed.error) };
}

/** Runs a domain call; a DomainError becomes a fail() that keeps what the person typed. */
export async function attempt<T, V>(
	values: V,
	work: () => Promise<T>
): Promise<T | ActionFailure<FormFailure<V>>> {
	try {
		return await work();
	} catch (failure) {
		if (failure instanceof DomainError) {
			return fail(failure.status, {
				errors: failure.issues ?? { form: [failure.message] },
				values,
				extra: failure.extra
			});
		}
		throw failure;
	}
}

/** For page loads: a DomainError (404, 409 …) becomes SvelteKit's error page with the same status and words. */
export async function forPage<T>(work: () => Promise<T>): Promise<T> {
	try {
		return await work();
	} catch (failure) {
		if (failure instanceof DomainError) error(failure.status, failure.message);
		throw failure;
	}
}

const RELOAD =
	'Reload the page and try again: the form did not say which version you were looking at.';
const versionSchema = z.object({ version: versionNumber(RELOAD, { coerce: true }) });

/** The `version` a form carries for its optimistic lock (a whole number from 1), or the field error. */
export function readVersion(
	form: FormData
): { ok: true; version: number } | { ok: false; errors: FormErrors } {
	const parsed = parseForm(versionSchema, { version: form.get('version') ?? undefined });
	return parsed.ok ? { ok: true, version: parsed.data.version } : parsed;
}
