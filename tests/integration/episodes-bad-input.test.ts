/**
 * Bad input to episode work gets a clear 4xx in plain words and leaves what was saved untouched
 * (OWASP ASVS 4.0 V5 input validation). The script preview sanitises: the XSS vectors below are
 * the classic ones from the OWASP XSS Filter Evasion Cheat Sheet (from memory), and the answer is
 * read back with htmlparser2 (an independent HTML parser from npm) to look for what survived.
 */
import { beforeAll, describe, expect, test } from 'vitest';
import { parseDocument } from 'htmlparser2';
import { Visitor, demo, signedIn, sql } from '../helpers/http';

let host: Visitor;
let producer: Visitor;
let episodeId = '';
let segment: { id: string; version: number; script: { version: number } };

const savedScript = async () =>
	(await sql(`SELECT body, version FROM segment_script WHERE segment_id = $1`, [segment.id]))[0];

beforeAll(async () => {
	[host, producer] = await Promise.all([signedIn(demo.host), signedIn(demo.producer)]);
	const created = await producer.api('/api/episodes', {
		method: 'POST',
		json: { title: `Bad input ${Date.now()}`, targetRuntimeSeconds: 600, frameRate: '29.97' }
	});
	episodeId = created.body.episode.id;
	segment = (
		await host.api(`/api/episodes/${episodeId}/segments`, {
			method: 'POST',
			json: { kind: 'overview', title: 'Intro', plannedSeconds: 60 }
		})
	).body.segment;
	await host.api(`/api/segments/${segment.id}/script`, {
		method: 'PUT',
		json: { body: 'The saved text.', version: segment.script.version }
	});
});

/** Every element and attribute in an HTML fragment, as htmlparser2 reads it. */
function elementsOf(html: string): { name: string; attributes: Record<string, string> }[] {
	const found: { name: string; attributes: Record<string, string> }[] = [];
	const walk = (node: {
		type?: string;
		name?: string;
		attribs?: Record<string, string>;
		children?: unknown[];
	}) => {
		if (node.type === 'tag' || node.type === 'script' || node.type === 'style')
			found.push({ name: node.name!, attributes: node.attribs ?? {} });
		for (const child of node.children ?? []) walk(child as never);
	};
	walk(parseDocument(html) as never);
	return found;
}

describe('scripts', () => {
	test('a 2 MB script is refused in words and nothing is saved', async () => {
		const before = await savedScript();
		const result = await host.api(`/api/segments/${segment.id}/script`, {
			method: 'PUT',
			json: { body: 'spanner '.repeat(262_144), version: before.version }
		});
		// The server's request body limit is 40 MiB (BODY_SIZE_LIMIT, set by the start command and the tests), so the
		// script's own limit answers, with what to do.
		expect(result.status).toBe(400);
		expect(result.body.issues.body[0]).toMatch(
			/limited to 100,000 characters: split it into two segments/
		);
		expect(await savedScript()).toEqual(before);
	});

	test('a script over 100,000 characters but under the body limit is refused with the limit and what to do', async () => {
		const before = await savedScript();
		const result = await host.api(`/api/segments/${segment.id}/script`, {
			method: 'PUT',
			json: { body: 'x'.repeat(100_001), version: before.version }
		});
		expect(result.status).toBe(400);
		expect(result.body.issues.body[0]).toMatch(
			/limited to 100,000 characters: split it into two segments/
		);
		expect(await savedScript()).toEqual(before);
	});

	test('the preview strips scripts, event handlers and javascript: links, keeping the text', async () => {
		const markdown = [
			'Hello **crew**.',
			'<script>alert(1)</script>',
			'<img src=x onerror=alert(2)>',
			'[click me](javascript:alert(3))',
			'<a href="jav&#x09;ascript:alert(4)">tabbed</a>',
			'<svg onload=alert(5)><circle /></svg>',
			'<p onclick="alert(6)" style="color:red">styled</p>',
			'<iframe src="https://example.test"></iframe>',
			'[fine link](https://shop.torquehaven.test/p/kbs-lb-300t)'
		].join('\n\n');
		const result = await host.api(`/api/episodes/${episodeId}/script-preview`, {
			method: 'POST',
			json: { markdown }
		});
		expect(result.status).toBe(200);
		const elements = elementsOf(result.body.html);
		const names = elements.map((element) => element.name);
		for (const banned of ['script', 'img', 'svg', 'iframe', 'style'])
			expect(names).not.toContain(banned);
		for (const element of elements) {
			for (const [attribute, value] of Object.entries(element.attributes)) {
				expect(attribute.startsWith('on')).toBe(false);
				expect(attribute).not.toBe('style');
				expect(value.replace(/\s/g, '').toLowerCase()).not.toContain('javascript:');
			}
		}
		expect(result.body.html).toContain('<strong>crew</strong>');
		expect(result.body.html).toContain('click me');
		expect(result.body.html).toContain('href="https://shop.torquehaven.test/p/kbs-lb-300t"');
		expect(result.body.html).not.toContain('alert(');
		// Spoken words: Hello crew, click me, tabbed, styled, fine link (URLs and tags are not words) = 8,
		// plus the script block's text "alert(1)", read "alert one" (figures count as spoken) = 10.
		expect(result.body.words).toBe(10);
	});

	test('broken HTML inside Markdown saves as typed and previews without leaking markup', async () => {
		const before = await savedScript();
		const body = 'Torque it <b>in three <i>passes</b> then <div class="x">check <span>again';
		const saved = await host.api(`/api/segments/${segment.id}/script`, {
			method: 'PUT',
			json: { body, version: before.version }
		});
		expect(saved.status).toBe(200);
		expect((await savedScript()).body).toBe(body);
		const preview = await host.api(`/api/episodes/${episodeId}/script-preview`, {
			method: 'POST',
			json: { markdown: body }
		});
		expect(preview.status).toBe(200);
		const names = elementsOf(preview.body.html).map((element) => element.name);
		// A bare <span> may stay (it carries nothing); only the direction class is ever kept on one.
		expect(
			names.every((name) => ['p', 'strong', 'em', 'b', 'i', 'span'].includes(name) || name === 'br')
		).toBe(true);
		expect(preview.body.html).not.toContain('class=');
	});

	test('malformed JSON and a missing version are refused in words', async () => {
		const bad = await host.api(`/api/segments/${segment.id}/script`, {
			method: 'PUT',
			body: '{"body": "half',
			headers: { 'content-type': 'application/json' }
		});
		expect(bad.status).toBe(400);
		expect(bad.body.error).toMatch(/not valid JSON/);
		const noVersion = await host.api(`/api/segments/${segment.id}/script`, {
			method: 'PUT',
			json: { body: 'x' }
		});
		expect(noVersion.status).toBe(400);
		expect(noVersion.body.issues.version[0]).toMatch(/version is missing/);
	});
});

describe('rundown and episodes', () => {
	test('negative and nonsense durations are refused per field, and no segment is added', async () => {
		const count = async () =>
			Number(
				(await sql(`SELECT count(*)::int AS n FROM segment WHERE episode_id = $1`, [episodeId]))[0]
					.n
			);
		const before = await count();
		for (const plannedSeconds of [-5, '-1:30', 'about a minute', 1.5, '1:75']) {
			const result = await host.api(`/api/episodes/${episodeId}/segments`, {
				method: 'POST',
				json: { kind: 'tips', title: 'Bad', plannedSeconds }
			});
			expect(result.status, String(plannedSeconds)).toBe(400);
			expect(result.body.issues.plannedSeconds[0]).toMatch(/negative|not a duration|whole seconds/);
		}
		const negativeTarget = await producer.api('/api/episodes', {
			method: 'POST',
			json: { title: 'Negative', targetRuntimeSeconds: -600, frameRate: '25' }
		});
		expect(negativeTarget.status).toBe(400);
		expect(negativeTarget.body.issues.targetRuntimeSeconds[0]).toMatch(/can’t be negative/);
		expect(await count()).toBe(before);
	});

	test('unknown kinds, hazards and frame rates are refused with the choices', async () => {
		const kind = await host.api(`/api/episodes/${episodeId}/segments`, {
			method: 'POST',
			json: { kind: 'montage', title: 'x', plannedSeconds: 1 }
		});
		expect(kind.body.issues.kind[0]).toMatch(/Pick a kind of segment/);
		const hazard = await host.api(`/api/episodes/${episodeId}/segments`, {
			method: 'POST',
			json: { kind: 'tips', title: 'x', plannedSeconds: 1, hazards: ['lava'] }
		});
		expect(hazard.body.issues['hazards.0'][0]).toMatch(/Pick hazards from the list/);
		const rate = await producer.api('/api/episodes', {
			method: 'POST',
			json: { title: 'x', targetRuntimeSeconds: 60, frameRate: '29.98' }
		});
		expect(rate.body.issues.frameRate[0]).toMatch(/listed frame rates/);
	});

	test('a caution placed with a bad timecode gets the timecode module’s words; a dropped label is refused', async () => {
		const flagged = (
			await host.api(`/api/episodes/${episodeId}/segments`, {
				method: 'POST',
				json: {
					kind: 'install-step',
					title: 'Jack it',
					plannedSeconds: 30,
					hazards: ['raised-vehicle']
				}
			})
		).body.segment;
		const caution = flagged.cautions[0];
		// SMPTE ST 12-1: at 29.97 drop-frame the labels ;00 and ;01 of minute 1 do not exist.
		const dropped = await producer.api(`/api/segments/${flagged.id}/cautions/raised-vehicle`, {
			method: 'PATCH',
			json: { at: '00:01:00;00', version: caution.version }
		});
		expect(dropped.status).toBe(400);
		expect(dropped.body.issues.at[0]).toMatch(/doesn't exist in drop-frame timecode.*00:01:00;02/);
		const negative = await producer.api(`/api/segments/${flagged.id}/cautions/raised-vehicle`, {
			method: 'PATCH',
			json: { atFrame: -1, version: caution.version }
		});
		expect(negative.status).toBe(400);
		const tooLong = await host.api(`/api/segments/${flagged.id}/cautions/raised-vehicle`, {
			method: 'PATCH',
			json: { text: 'x'.repeat(141), version: caution.version }
		});
		expect(tooLong.body.issues.text[0]).toMatch(/under 140 characters/);
		const unflagged = await producer.api(`/api/segments/${flagged.id}/cautions/brakes`, {
			method: 'PATCH',
			json: { at: '0:10', version: 1 }
		});
		expect(unflagged.status).toBe(404);
		expect(
			(await sql(`SELECT at_frame, version FROM caution WHERE segment_id = $1`, [flagged.id]))[0]
		).toEqual({ at_frame: null, version: caution.version });
	});

	test('ids that are not uuids, or name nothing, are 404s, not server errors', async () => {
		for (const path of [
			'/api/episodes/not-a-uuid',
			'/api/segments/not-a-uuid',
			'/api/episodes/00000000-0000-4000-8000-000000000000/segments',
			'/api/segments/00000000-0000-4000-8000-000000000000/shots'
		]) {
			expect((await host.api(path)).status, path).toBe(404);
		}
		expect(
			(await host.request('/episodes/not-a-uuid', { headers: { accept: 'text/html' } })).status
		).toBe(404);
		expect(
			(
				await host.request(`/episodes/${episodeId}/rundown/00000000-0000-4000-8000-000000000000`, {
					headers: { accept: 'text/html' }
				})
			).status
		).toBe(404);
	});

	test('a teaser promise on a segment that is not a teaser is refused', async () => {
		const result = await host.api(`/api/episodes/${episodeId}/segments`, {
			method: 'POST',
			json: { kind: 'tips', title: 'x', plannedSeconds: 1, promiseTitle: 'Next week' }
		});
		expect(result.status).toBe(400);
		expect(result.body.error).toMatch(/Only a teaser segment can promise/);
	});

	test('a form with bad values keeps what the person typed', async () => {
		const result = await host.action(`/episodes/${episodeId}/rundown?/add`, {
			kind: 'tips',
			title: 'Kept title',
			planned: '-2:00'
		});
		expect(result.status).toBe(400);
		expect(result.data.values.title).toBe('Kept title');
		expect(result.data.errors.plannedSeconds[0]).toMatch(/can’t be negative/);
	});
});
