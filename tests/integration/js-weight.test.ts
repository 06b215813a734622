/**
 * The JavaScript budget (DEVELOPERS.md, "JavaScript budget"): every page's first load sends under
 * 80 KB of gzipped JavaScript, and no page's JavaScript carries Zod (unless its form checks there)
 * or `marked` (the script Markdown reader, which runs only on the server and in the editor's
 * counting worker).
 *
 * How it is measured: from the build this run tests (WRENCHROLL_BUILD_DIR or build/), not in a
 * browser. SvelteKit's server output lists, for the client, the start and app entries with their
 * imports and, for every page node (layout, page, error page), the JavaScript files that node loads
 * statically, transitively (the files a page names in its `modulepreload` links). A route's page
 * loads the app entries plus its layouts' and its leaf's lists. We chose this over loading pages
 * in Chromium as each role because it covers every route, including ones the demo data or a role
 * never reaches, with no ids to look up and nothing that depends on timing. What it leaves out by
 * design: a Web Worker (loaded with `new Worker`, not imported) and code a page imports later with
 * `import()` (the spec-card checks, loaded after the page; their chunk is still checked for
 * `marked`).
 *
 * Sizes are gzip (RFC 1952) at node:zlib's default level, the reference encoder here (tests/REFERENCES.md,
 * "JavaScript weight"); the server also offers brotli, which is smaller, so gzip is the stricter
 * measure. 80 KB = 80 × 1024 bytes, our own budget.
 */
import { readFileSync, readdirSync, existsSync } from 'node:fs';
import path from 'node:path';
import { gzipSync } from 'node:zlib';
import { describe, expect, test } from 'vitest';

const root = path.resolve(import.meta.dirname, '../..');
const buildDir = path.resolve(root, process.env.WRENCHROLL_BUILD_DIR ?? 'build');
const serverChunks = path.join(buildDir, 'server', 'chunks');
const clientDir = path.join(buildDir, 'client');

const BUDGET_BYTES = 80 * 1024;

/**
 * Text that appears in each library's own code and survives minifying, so a chunk holding it holds
 * the library. Zod names its error class "ZodError" (zod's `ZodError`, a string it keeps for
 * `error.name`); marked's parser errors end with its "Please report this to" line, with marked's
 * repository address. Both checked against the build before this change, where they were found in the
 * chunks that carried each library (tests/REFERENCES.md, "JavaScript weight").
 */
const LIBRARY_MARKS = {
	zod: 'ZodError',
	marked: 'Please report this to https://github.com/markedjs'
} as const;

/** Pages whose form checks input in the browser with the Zod schemas, and so may load Zod. None. */
const PAGES_ALLOWED_ZOD: ReadonlySet<string> = new Set();

function serverFile(folder: string, pattern: RegExp): string {
	const name = readdirSync(folder).find((file) => pattern.test(file));
	if (!name) throw new Error(`No ${pattern} in ${folder}: build the app first (npm run build).`);
	return readFileSync(path.join(folder, name), 'utf8');
}

interface RoutePage {
	id: string;
	nodes: number[];
}

function readBuild() {
	const manifest = serverFile(serverChunks, /^manifest\.js-.*\.js$/);
	const client = manifest.match(/client: \{[^}]*?imports:(\[[^\]]*\])/);
	if (!client) throw new Error('The build manifest lists no client imports.');
	const appImports: string[] = JSON.parse(client[1]);

	const nodeImports = new Map<number, string[]>();
	const nodesDir = path.join(serverChunks, 'nodes');
	for (const file of readdirSync(nodesDir)) {
		const index = file.match(/^(\d+)\.js-.*\.js$/);
		if (!index) continue;
		const text = readFileSync(path.join(nodesDir, file), 'utf8');
		const imports = text.match(/const imports = (\[[^\]]*\])/);
		nodeImports.set(Number(index[1]), imports ? JSON.parse(imports[1]) : []);
	}

	const pages: RoutePage[] = [];
	const route =
		/\{\s*id: "([^"]*)",\s*pattern: [^\n]*\n\s*params: [^\n]*\n\s*page: (?:null|\{ layouts: \[([^\]]*)\], errors: \[([^\]]*)\], leaf: (\d+) \})/g;
	for (const [, id, layouts, errors, leaf] of manifest.matchAll(route)) {
		if (leaf === undefined) continue;
		const layoutNodes = layouts.split(',').filter(Boolean).map(Number);
		pages.push({ id, nodes: [...layoutNodes, Number(leaf)] });
		// The error page this route shows (its nearest error node under its layouts).
		const errorNodes = errors.split(',');
		for (let depth = errorNodes.length - 1; depth >= 0; depth--) {
			if (errorNodes[depth] === '') continue;
			pages.push({
				id: `${id} (error page)`,
				nodes: [...layoutNodes.slice(0, depth + 1), Number(errorNodes[depth])]
			});
			break;
		}
	}
	return { appImports, nodeImports, pages };
}

const gzipped = new Map<string, number>();
function gzippedBytes(file: string): number {
	let size = gzipped.get(file);
	if (size === undefined) {
		size = gzipSync(readFileSync(path.join(clientDir, file))).length;
		gzipped.set(file, size);
	}
	return size;
}

function pageFiles(
	page: RoutePage,
	appImports: string[],
	nodeImports: Map<number, string[]>
): string[] {
	const files = new Set(appImports);
	for (const node of page.nodes) {
		const imports = nodeImports.get(node);
		if (!imports) throw new Error(`Node ${node} of ${page.id} is missing from the build.`);
		for (const file of imports) files.add(file);
	}
	return [...files];
}

const build = readBuild();

describe('JavaScript sent to the browser', () => {
	test('the build lists the pages it is measured on', () => {
		// A change in SvelteKit's output format would otherwise let every check below pass on nothing.
		expect(build.appImports.length).toBeGreaterThan(0);
		expect(build.pages.length).toBeGreaterThan(30);
		expect(build.pages.map((page) => page.id)).toEqual(
			expect.arrayContaining(['/(app)', '/signin', '/(app)/episodes/[id]/spec-cards'])
		);
		for (const file of build.appImports) expect(existsSync(path.join(clientDir, file))).toBe(true);
	});

	test.each(build.pages.map((page) => [page.id, page] as const))(
		'%s loads under 80 KB of gzipped JavaScript, without marked or (without a form that checks in the browser) Zod',
		(_id, page) => {
			const files = pageFiles(page, build.appImports, build.nodeImports);
			const total = files.reduce((sum, file) => sum + gzippedBytes(file), 0);
			const heaviest = files
				.map((file) => `${file} ${(gzippedBytes(file) / 1024).toFixed(1)} KB`)
				.sort((a, b) => Number.parseFloat(b.split(' ')[1]) - Number.parseFloat(a.split(' ')[1]))
				.slice(0, 3);
			expect(
				total,
				`${page.id}: ${(total / 1024).toFixed(1)} KB; heaviest ${heaviest}`
			).toBeLessThan(BUDGET_BYTES);
			for (const file of files) {
				const code = readFileSync(path.join(clientDir, file), 'utf8');
				expect(code.includes(LIBRARY_MARKS.marked), `marked in ${file} of ${page.id}`).toBe(false);
				if (!PAGES_ALLOWED_ZOD.has(page.id))
					expect(code.includes(LIBRARY_MARKS.zod), `Zod in ${file} of ${page.id}`).toBe(false);
			}
		}
	);

	test('no JavaScript module of the app carries marked; only the editor’s counting worker does', () => {
		const immutable = path.join(clientDir, '_app', 'immutable');
		const carriers: string[] = [];
		for (const folder of ['entry', 'nodes', 'chunks', 'workers']) {
			const dir = path.join(immutable, folder);
			if (!existsSync(dir)) continue;
			for (const file of readdirSync(dir).filter((name) => name.endsWith('.js'))) {
				if (readFileSync(path.join(dir, file), 'utf8').includes(LIBRARY_MARKS.marked))
					carriers.push(`${folder}/${file.replace(/[.-][\w-]{8}\.js$/, '')}`);
			}
		}
		// The live word count runs marked in a Web Worker (DEVELOPERS.md, "Script Markdown").
		expect(carriers).toEqual(['workers/spoken-words.worker']);
	});
});
