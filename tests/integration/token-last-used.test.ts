/**
 * A personal API token records when it was last used, but a script calling many times a second must
 * not turn every read into a database write: the time is written at most once a minute per token.
 */
import { expect, test } from 'vitest';
import { Visitor, demo, signedIn, sql } from '../helpers/http';

test('a token records its first use, then writes its last-used time at most once a minute', async () => {
	const editor = await signedIn(demo.editor);
	const created = await editor.api('/api/tokens', {
		method: 'POST',
		json: { label: 'titler script' }
	});
	expect(created.status).toBe(201);
	const id: string = created.body.token.id;
	const bearer = { authorization: `Bearer ${created.body.token.token}` };
	const lastUsed = async () =>
		(await sql(`SELECT last_used_at FROM api_token WHERE id = $1`, [id]))[0]
			.last_used_at as Date | null;
	const script = new Visitor();

	expect(await lastUsed()).toBeNull();
	expect((await script.api('/api/me', { headers: bearer })).status).toBe(200);
	const first = await lastUsed();
	expect(first).toBeInstanceOf(Date);

	// 30 seconds ago: inside the minute, so another call leaves it alone.
	await sql(`UPDATE api_token SET last_used_at = now() - interval '30 seconds' WHERE id = $1`, [
		id
	]);
	const recent = await lastUsed();
	expect((await script.api('/api/me', { headers: bearer })).status).toBe(200);
	expect((await lastUsed())?.getTime()).toBe(recent?.getTime());

	// Two minutes ago: the next call writes the time again.
	await sql(`UPDATE api_token SET last_used_at = now() - interval '2 minutes' WHERE id = $1`, [id]);
	expect((await script.api('/api/me', { headers: bearer })).status).toBe(200);
	expect(Date.now() - ((await lastUsed())?.getTime() ?? 0)).toBeLessThan(60_000);

	expect((await editor.api(`/api/tokens/${id}`, { method: 'DELETE' })).status).toBe(204);
});
