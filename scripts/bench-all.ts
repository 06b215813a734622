/**
 * npm run bench: every benchmark script, one after another, each in a process of its own, so one
 * that misses its target, throws or crashes never keeps the others from running. Builds the app
 * first when the build (WRENCHROLL_BUILD_DIR or build/) is missing or older than its sources, and
 * exits 1 at the end if any bench missed or failed.
 *
 *   npm run bench                      every bench
 *   npm run bench uploads              only the upload bench (scripts/bench-uploads.ts)
 *   npm run bench parts                only the parts bench (scripts/bench-parts.ts)
 *   npm run bench episode              only the episode page and API bench (scripts/bench-episode.ts)
 *   npm run bench "episode list"       "parts search", "chapter export at scale", "footage and notes":
 *                                      the paging benches
 *                                      (scripts/bench-paging.ts), lists at a real channel's size
 *   npm run bench storage              the storage view at 10,000 episodes (scripts/bench-storage.ts)
 *   npm run bench "chapter export"     any other name: that bench of scripts/bench.ts
 */
import { spawnSync } from 'node:child_process';
import { existsSync, readdirSync, statSync } from 'node:fs';
import path from 'node:path';
import { projectRoot } from './lib/config.ts';

interface BenchScript {
	script: string;
	/** The names that select this script alone; null: the script that takes every other name. */
	names: string[] | null;
}

const SCRIPTS: BenchScript[] = [
	{ script: 'scripts/bench.ts', names: null },
	{ script: 'scripts/bench-uploads.ts', names: ['uploads'] },
	{ script: 'scripts/bench-parts.ts', names: ['parts'] },
	{ script: 'scripts/bench-episode.ts', names: ['episode'] },
	{
		script: 'scripts/bench-paging.ts',
		names: ['episode list', 'parts search', 'chapter export at scale', 'footage and notes']
	},
	{ script: 'scripts/bench-storage.ts', names: ['storage'] }
];

/** What the build is made from: a change to any of these makes the build stale. */
const BUILD_SOURCES = [
	'src',
	'static',
	'svelte.config.js',
	'vite.config.ts',
	'tsconfig.json',
	'package-lock.json'
];

function newestSource(): { file: string; mtimeMs: number } {
	let newest = { file: '', mtimeMs: 0 };
	const consider = (file: string) => {
		const { mtimeMs } = statSync(file);
		if (mtimeMs > newest.mtimeMs) newest = { file, mtimeMs };
	};
	for (const source of BUILD_SOURCES) {
		const full = path.join(projectRoot, source);
		if (!existsSync(full)) continue;
		if (!statSync(full).isDirectory()) consider(full);
		else
			for (const entry of readdirSync(full, { recursive: true, withFileTypes: true }))
				if (entry.isFile()) consider(path.join(entry.parentPath, entry.name));
	}
	return newest;
}

/** Builds into the bench's build folder unless a build newer than every source is there. */
function buildIfNeeded(buildDir: string) {
	const built = path.join(buildDir, 'handler.js');
	const newest = newestSource();
	let reason = '';
	if (!existsSync(built)) reason = 'there is no build yet';
	else if (statSync(built).mtimeMs < newest.mtimeMs)
		reason = `${path.relative(projectRoot, newest.file)} is newer than the build`;
	if (!reason) return;
	console.log(`building the app into ${path.relative(projectRoot, buildDir)} (${reason})…`);
	const result = spawnSync(
		process.execPath,
		[path.join(projectRoot, 'node_modules/vite/bin/vite.js'), 'build', '--logLevel', 'warn'],
		{ cwd: projectRoot, env: { ...process.env, WRENCHROLL_BUILD_DIR: buildDir }, stdio: 'inherit' }
	);
	if (result.status !== 0) {
		console.error('the build failed (see above); no bench ran.');
		process.exit(1);
	}
}

function main() {
	const buildDir = path.resolve(projectRoot, process.env.WRENCHROLL_BUILD_DIR ?? 'build');
	buildIfNeeded(buildDir);

	const named = process.argv.slice(2);
	const plan = SCRIPTS.map(({ script, names }) => {
		if (!named.length) return { script, args: [] as string[] };
		const mine = named.filter((name) =>
			names ? names.includes(name) : !SCRIPTS.some((other) => other.names?.includes(name))
		);
		// A script that answers to several names (the paging benches) runs only the ones asked for.
		return mine.length ? { script, args: names && names.length === 1 ? [] : mine } : null;
	}).filter((step) => step !== null);

	const outcomes: { script: string; status: string }[] = [];
	for (const { script, args } of plan) {
		console.log(`\n━━━ ${script} ${args.map((arg) => JSON.stringify(arg)).join(' ')}\n`);
		const result = spawnSync(
			path.join(projectRoot, 'node_modules/.bin/tsx'),
			[path.join(projectRoot, script), ...args],
			{
				cwd: projectRoot,
				env: { ...process.env, WRENCHROLL_BUILD_DIR: buildDir },
				stdio: 'inherit'
			}
		);
		outcomes.push({
			script,
			status:
				result.status === 0
					? 'all targets met'
					: result.status === null
						? `stopped by ${result.signal}`
						: 'TARGET MISSED or failed to run'
		});
	}
	console.log('\n━━━ summary\n');
	for (const { script, status } of outcomes) console.log(`${script.padEnd(26)} ${status}`);
	const ok = outcomes.every(({ status }) => status === 'all targets met');
	console.log(ok ? '\nevery bench met its targets' : '\nsome bench missed its target or failed');
	process.exit(ok ? 0 : 1);
}

main();
