/**
 * The one error type every spec module throws for input it cannot use.
 * The message is written for the crew: what is wrong and what to type instead,
 * so forms and API routes can show it as it is.
 */
export class SpecError extends Error {
	constructor(message: string) {
		super(message);
		this.name = 'SpecError';
	}
}

/** True when `error` came from a spec module (safe to show to a person). */
export function isSpecError(error: unknown): error is SpecError {
	return error instanceof SpecError;
}
