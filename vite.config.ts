import { sveltekit } from '@sveltejs/kit/vite';
import tailwindcss from '@tailwindcss/vite';
import { defineConfig } from 'vitest/config';

export default defineConfig({
	plugins: [tailwindcss(), sveltekit()],
	build: {
		rolldownOptions: {
			treeshake: {
				// marked's package does not declare itself free of side effects, so a page that imports
				// anything from $lib/script/timing (a pace, a tolerance) would get the whole Markdown
				// lexer. It has none worth keeping: only what a module actually uses stays (the
				// JavaScript budget, DEVELOPERS.md; tests/integration/js-weight.test.ts checks it).
				moduleSideEffects: (id: string) =>
					/[\\/]node_modules[\\/]marked[\\/]/.test(id) ? false : undefined
			}
		}
	},
	test: {
		projects: [
			{
				extends: true,
				test: {
					name: 'unit',
					include: ['tests/unit/**/*.test.ts'],
					environment: 'node'
				}
			},
			{
				// Integration and browser tests share one throwaway PostgreSQL cluster,
				// one fake mail server and one built server, started in global setup.
				// One project, so that world starts once; `npm run test:integration` and
				// `npm run test:browser` pass it one folder each.
				extends: true,
				test: {
					name: 'server',
					include: ['tests/integration/**/*.test.ts', 'tests/browser/**/*.test.ts'],
					environment: 'node',
					globalSetup: ['tests/helpers/global-setup.ts'],
					fileParallelism: false,
					testTimeout: 60_000,
					hookTimeout: 120_000,
					// A page's answer after a click on a busy CI machine (a save that waits for a script
					// reader, say) can take more than expect.poll's default second; it still has to come.
					expect: { poll: { timeout: 5_000 } }
				}
			}
		]
	}
});
