/**
 * A "not found" inside the app keeps the app around it: the header with the person, the channel and
 * its switcher, and the navigation, so the way on is one click away. Signed out, the error stays a
 * card of its own. RFC 9110 §15.5.5 (404 Not Found) for the status.
 */
import { expect, test } from 'vitest';
import { Visitor, demo, signedIn } from '../helpers/http';

const MISSING = '/episodes/00000000-0000-4000-8000-000000000000';

test('signed in, a missing episode is a 404 page inside the app, with its header and navigation', async () => {
	const producer = await signedIn(demo.producer);
	const response = await producer.request(MISSING);
	expect(response.status).toBe(404);
	const html = await response.text();
	expect(html).toContain('data-testid="app-error"');
	expect(html).toContain('Not on this bench');
	expect(html).toContain('Sign out');
	expect(html).toContain('href="/episodes"');
});

test('signed out, the same address is not a page of the app', async () => {
	const response = await new Visitor().request(MISSING);
	expect([303, 401]).toContain(response.status);
	expect(await response.text()).not.toContain('data-testid="app-error"');
});
