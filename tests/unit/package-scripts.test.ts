/**
 * The package scripts that run vitest name projects that exist in vite.config.ts, and the folders
 * they pass lie inside that project's files. (`npm run test:integration` once named a project
 * that did not exist, and vitest stopped with "No projects matched the filter".)
 */
import { existsSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, test } from 'vitest';
import viteConfig from '../../vite.config.ts';

const root = path.resolve(import.meta.dirname, '../..');
const scripts: Record<string, string> = JSON.parse(
	readFileSync(path.join(root, 'package.json'), 'utf8')
).scripts;

type Project = { test?: { name?: string; include?: string[] } };
const projects = ((viteConfig.test?.projects ?? []) as Project[]).map((project) => ({
	name: project.test?.name ?? '',
	include: project.test?.include ?? []
}));

/** The words after `vitest run`: `--project` names and the path filters. */
function vitestArguments(script: string): { projects: string[]; paths: string[] } {
	const words = script.split(/\s+/);
	const start = words.indexOf('run', words.indexOf('vitest'));
	const found = { projects: [] as string[], paths: [] as string[] };
	for (let index = start + 1; index < words.length; index++) {
		if (words[index] === '--project') found.projects.push(words[++index]);
		else if (!words[index].startsWith('-')) found.paths.push(words[index]);
	}
	return found;
}

const vitestScripts = Object.entries(scripts).filter(([, script]) => /\bvitest run\b/.test(script));

describe('package scripts that run vitest', () => {
	test('there are scripts for the unit, integration and browser tests', () => {
		expect(vitestScripts.map(([name]) => name)).toEqual(
			expect.arrayContaining(['test:unit', 'test:integration', 'test:browser'])
		);
	});

	test.each(vitestScripts)('%s names only projects that exist', (_name, script) => {
		const named = vitestArguments(script).projects;
		expect(named.length).toBeGreaterThan(0);
		for (const project of named) expect(projects.map((known) => known.name)).toContain(project);
	});

	test.each(vitestScripts)('%s passes only folders inside its project', (_name, script) => {
		const { projects: named, paths } = vitestArguments(script);
		const includes = projects
			.filter((project) => named.includes(project.name))
			.flatMap((project) => project.include);
		for (const filter of paths) {
			expect(existsSync(path.join(root, filter)), `${filter} exists`).toBe(true);
			const folder = filter.replace(/\/$/, '');
			expect(
				includes.some((glob) => glob.startsWith(`${folder}/`)),
				`${filter} holds files of ${named.join(', ')}`
			).toBe(true);
		}
	});
});
