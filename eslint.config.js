// ESLint flat config in the shape the official SvelteKit templates ship: the recommended rules of
// ESLint, typescript-eslint and eslint-plugin-svelte, with Prettier owning every formatting question.
import js from '@eslint/js';
import prettier from 'eslint-config-prettier';
import svelte from 'eslint-plugin-svelte';
import globals from 'globals';
import ts from 'typescript-eslint';
import svelteConfig from './svelte.config.js';

export default ts.config(
	{
		ignores: [
			'node_modules/',
			'build/',
			'.build/',
			'.svelte-kit/',
			'.data/',
			'uploads/',
			'test-results/',
			'static/'
		]
	},
	js.configs.recommended,
	...ts.configs.recommended,
	...svelte.configs.recommended,
	prettier,
	...svelte.configs.prettier,
	{
		languageOptions: { globals: { ...globals.browser, ...globals.node } },
		rules: {
			// typescript-eslint's advice for TypeScript projects: the compiler already checks this.
			'no-undef': 'off',
			'@typescript-eslint/no-unused-vars': [
				'error',
				{ argsIgnorePattern: '^_', varsIgnorePattern: '^_', caughtErrors: 'none' }
			],
			// The app is served at the root (no paths.base), so resolve() would return every href
			// unchanged; plain root-relative links read better in the markup.
			'svelte/no-navigation-without-resolve': 'off',
			// The validators and cleaners match control characters on purpose (refusing NUL, cleaning
			// file names and chapter titles).
			'no-control-regex': 'off',
			// Svelte 5 trims whitespace at the edges of a block, so {' · '} keeps a deliberate space.
			'svelte/no-useless-mustaches': 'off',
			'svelte/prefer-writable-derived': 'error',
			'@typescript-eslint/no-explicit-any': 'error'
		}
	},
	{
		// Kysely's documented migration signature is up(db: Kysely<any>): a migration is frozen in
		// time and must not depend on today's Database type. Tests read arbitrary JSON answers.
		files: ['migrations/**', 'scripts/lib/migrator.ts', 'tests/**'],
		rules: { '@typescript-eslint/no-explicit-any': 'off' }
	},
	{
		// marked is quadratic on some scripts inside the length limit, so script Markdown is read only in
		// workers with a time limit: src/lib/server/episodes/script-reader.ts on the server and the
		// editor's live-word-count.ts in the browser (DEVELOPERS.md, "Script Markdown").
		files: ['src/**/*.ts', 'src/**/*.svelte'],
		ignores: [
			'src/lib/server/episodes/markdown.ts',
			'src/lib/script/timing.ts',
			'src/lib/server/episodes/script-reader-worker.ts',
			'src/**/spoken-words.worker.ts'
		],
		rules: {
			'no-restricted-imports': [
				'error',
				{
					paths: [
						{
							name: 'marked',
							message: 'Read script Markdown through $lib/server/episodes/script-reader.'
						},
						{
							name: '$lib/server/episodes/markdown',
							message:
								'Use scriptHtml() from $lib/server/episodes/script-reader (a worker with a time limit).'
						},
						{
							name: '$lib/script/timing',
							importNames: ['countSpokenWords'],
							message:
								'Use spokenWords() from $lib/server/episodes/script-reader, or LiveWordCount in the editor (workers with a time limit).'
						}
					]
				}
			]
		}
	},
	{
		// A date formatter costs about 0.2 ms to make: components run their script on every render,
		// so they take theirs from $lib/date-format (made once) instead of making one per render or
		// per row (`toLocaleString` with options makes one on every call).
		files: ['src/**/*.svelte'],
		rules: {
			'no-restricted-syntax': [
				'error',
				{
					selector:
						"NewExpression[callee.object.name='Intl'][callee.property.name='DateTimeFormat']",
					message: 'Use dateFormat(options) from $lib/date-format (each formatter made once).'
				},
				{
					selector:
						'CallExpression[callee.property.name=/^toLocale(Date|Time)?String$/][arguments.length>1]',
					message:
						'Use dateFormat(options).format(date) from $lib/date-format (each formatter made once).'
				}
			]
		}
	},
	{
		files: ['**/*.svelte', '**/*.svelte.ts', '**/*.svelte.js'],
		languageOptions: {
			parserOptions: {
				projectService: true,
				extraFileExtensions: ['.svelte'],
				parser: ts.parser,
				svelteConfig
			}
		}
	}
);
