/** A copy of a request with a new form body, for handing checked fields to Auth.js's form actions. */
export function withFormBody(request: Request, body: FormData | URLSearchParams): Request {
	const headers = new Headers(request.headers);
	headers.delete('content-type');
	headers.delete('content-length');
	return new Request(request.url, { method: 'POST', headers, body });
}
