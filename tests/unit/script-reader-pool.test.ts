/**
 * The script-reader pool's size follows the work: one reader, started by the first read (here by
 * `startScriptReaders`; the server no longer starts one at boot), more only while reads run or
 * wait (at most SCRIPT_READER_COUNT running plus one spare), the extra ones ended once idle, so an
 * idle server does not hold a thread per core, and the last one ended once nobody has read a script
 * for a while. Every answer is still the renderer's own (the reference is `renderScriptMarkdown`
 * run directly, as in script-reader.test.ts).
 */
import { describe, expect, test } from 'vitest';
import {
	SCRIPT_READER_COUNT,
	keepIdleReadersFor,
	keepLastReaderFor,
	scriptHtml,
	spokenWords,
	scriptReaderCount,
	startScriptReaders
} from '../../src/lib/server/episodes/script-reader.ts';
import {
	MAX_SCRIPT_CHARACTERS,
	renderScriptMarkdown
} from '../../src/lib/server/episodes/markdown.ts';

const script = (step: number) =>
	`# Step ${step}\n\nSet the **stands** under the frame rails, then torque the lug nuts to spec.`;

describe('script-reader pool size', () => {
	test('starts one reader, grows while reads wait, and ends the extra readers once idle', async () => {
		keepIdleReadersFor(300);
		await startScriptReaders();
		expect(scriptReaderCount()).toBe(1);

		const steps = [1, 2, 3, 4, 5, 6, 7, 8];
		const reads = steps.map((step) => scriptHtml(script(step)));
		// Eight reads waiting: the pool starts as many readers as may run, plus the spare, no more.
		expect(scriptReaderCount()).toBe(SCRIPT_READER_COUNT + 1);
		const answers = await Promise.all(reads);
		answers.forEach((html, index) => expect(html).toBe(renderScriptMarkdown(script(steps[index]))));

		await expect.poll(scriptReaderCount, { timeout: 15_000, interval: 100 }).toBe(1);
		// The one kept takes the next script at once.
		expect(await scriptHtml(script(9))).toBe(renderScriptMarkdown(script(9)));
		expect(scriptReaderCount()).toBeLessThanOrEqual(2);
	}, 60_000);

	test('the last reader is ended once nobody has asked for a read for a while, and the next read starts one', async () => {
		keepIdleReadersFor(300);
		keepLastReaderFor(1_000);
		try {
			expect(await scriptHtml(script(10))).toBe(renderScriptMarkdown(script(10)));
			expect(scriptReaderCount()).toBeGreaterThanOrEqual(1);
			await expect.poll(scriptReaderCount, { timeout: 15_000, interval: 100 }).toBe(0);
			expect(await scriptHtml(script(11))).toBe(renderScriptMarkdown(script(11)));
			expect(scriptReaderCount()).toBeGreaterThanOrEqual(1);
		} finally {
			keepLastReaderFor(10 * 60_000);
		}
	}, 60_000);

	test('readers ended for running over the limit are replaced one for one, so the next pair of reads meets started readers', async () => {
		keepIdleReadersFor(60_000);
		await startScriptReaders();
		// marked's emphasis lexer is quadratic on `_a_a…` (script-reader.test.ts): both reads overrun.
		const hostile = '_a'.repeat(MAX_SCRIPT_CHARACTERS / 2);
		await Promise.all([scriptHtml(hostile), spokenWords(hostile)]);
		expect(scriptReaderCount()).toBeGreaterThanOrEqual(2);
	}, 60_000);
});
