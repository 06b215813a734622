/**
 * Form-action helpers for the episode pages: run a domain call and turn its refusal (a DomainError,
 * or a 403 from a rule about who may do what) into fail() with the person's values kept.
 */
import { error, fail, isHttpError, type ActionFailure } from '@sveltejs/kit';
import { DomainError } from './api';

export interface ActionProblem<V> {
	action: string;
	errors: Record<string, string[]>;
	values: V;
	extra?: Record<string, unknown>;
}

export type Attempted<T, V> =
	{ ok: true; value: T } | { ok: false; failure: ActionFailure<ActionProblem<V>> };

export async function attemptAction<T, V>(
	action: string,
	values: V,
	work: () => Promise<T>
): Promise<Attempted<T, V>> {
	try {
		return { ok: true, value: await work() };
	} catch (failure) {
		if (failure instanceof DomainError) {
			return {
				ok: false,
				failure: fail(failure.status, {
					action,
					errors: failure.issues ?? { form: [failure.message] },
					values,
					extra: failure.extra
				})
			};
		}
		if (isHttpError(failure) && (failure.status === 403 || failure.status === 404)) {
			return {
				ok: false,
				failure: fail(failure.status, { action, errors: { form: [failure.body.message] }, values })
			};
		}
		throw failure;
	}
}

/** A field-error failure from a zod parse. */
export const invalid = <V>(action: string, errors: Record<string, string[]>, values: V) =>
	fail(400, { action, errors, values });

export const text = (form: FormData, name: string) => String(form.get(name) ?? '');

/** For page loads: a domain "not found" becomes the 404 page instead of a server error. */
export async function found<T>(work: Promise<T>): Promise<T> {
	try {
		return await work;
	} catch (failure) {
		if (failure instanceof DomainError && failure.status === 404) error(404, failure.message);
		throw failure;
	}
}
