/**
 * SvelteKit reserves the action name "default" and throws a plain Error when a request names it
 * (`?/default`), which would answer 500. A request is input, so it gets a 404 like any other
 * unknown action: RFC 9110 §15.5.5 (404 Not Found), and the rule that no input causes a 500.
 */
import { expect, test } from 'vitest';
import { demo, signedIn } from '../helpers/http';

test('posting to a page action named "default" is a 404, not a server error', async () => {
	const producer = await signedIn(demo.producer);
	const enhanced = await producer.action('/crew?/default', { name: 'x' });
	expect(enhanced.status).toBe(404);

	const plain = await producer.request('/crew?/default', { method: 'POST', form: { name: 'x' } });
	expect(plain.status).toBe(404);

	// A real action on the same page still works as before (an empty invite is refused by its form).
	const invite = await producer.action('/crew?/invite', { email: '' });
	expect(invite.status).toBe(400);
});
