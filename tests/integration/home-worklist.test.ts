/**
 * The bench (home page) shows each role what waits for them, from the demo data: the producer an
 * episode publishing soon that is not locked, the merch team the pull list to tick before the next
 * shoot, the camera operator the next shoot day with its call time.
 */
import { expect, test } from 'vitest';
import { demo, signedIn } from '../helpers/http';

async function homePageText(email: string) {
	const visitor = await signedIn(email);
	const data = await visitor.api('/__data.json');
	expect(data.status).toBe(200);
	return JSON.stringify(data.body);
}

test('the producer sees an episode that publishes within three weeks and is still in the edit', async () => {
	const text = await homePageText(demo.producer);
	expect(text).toMatch(/3-inch rear block lift on Project Mule: publishes in \d+ days/);
	expect(text).toContain('Still at the edit stage');
});

test('the merch team sees the pull list to check for the next shoot day', async () => {
	const text = await homePageText(demo.merch);
	expect(text).toMatch(/\d+ pull-list items? to check for/);
});

test('the camera operator sees the next shoot day and its call time', async () => {
	const text = await homePageText(demo.camera);
	expect(text).toMatch(/Shoot [A-Z][a-z]{2}, [A-Z][a-z]{2} \d+, call 08:00/);
});
