/** The browser's calls to the JSON API: JSON in, an answer or the server's words out. */

export type Answer<T> =
	| { ok: true; data: T }
	| {
			ok: false;
			status: number;
			error: string;
			issues?: Record<string, string[]>;
			extra?: Record<string, unknown>;
	  };

/** A fetch that never throws: a dropped connection is an answer too. */
export async function call<T>(
	path: string,
	init: RequestInit & { json?: unknown } = {}
): Promise<Answer<T>> {
	const { json, ...rest } = init;
	let response: Response;
	try {
		response = await fetch(path, {
			...rest,
			headers: json === undefined ? rest.headers : { 'content-type': 'application/json' },
			body: json === undefined ? rest.body : JSON.stringify(json)
		});
	} catch (failure) {
		if (failure instanceof DOMException && failure.name === 'AbortError') throw failure;
		return {
			ok: false,
			status: 0,
			error: 'The server did not answer. Check the connection; nothing was changed.'
		};
	}
	const body = await response.json().catch(() => null);
	if (response.ok) return { ok: true, data: body as T };
	const { error, issues, ...extra } = (body ?? {}) as {
		error?: string;
		issues?: Record<string, string[]>;
	};
	return {
		ok: false,
		status: response.status,
		error: error ?? `The server answered ${response.status}; nothing was changed.`,
		issues,
		extra
	};
}
