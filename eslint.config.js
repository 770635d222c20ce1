/**
 * Lint rules, type-aware. Besides the recommended sets they keep the layers apart: pure
 * modules import no server code, a handful of them use no browser globals either, units know
 * nothing of acceptance, and only the permission and sign-in code reads `isAdmin`.
 */
import js from '@eslint/js';
import { defineConfig, globalIgnores } from 'eslint/config';
import svelte from 'eslint-plugin-svelte';
import globals from 'globals';
import ts from 'typescript-eslint';
import svelteKitConfig from './svelte.config.js';

// ESLint's cache cannot hold the function that picks runes mode per file; every file of ours
// is in runes mode anyway.
const svelteConfig = {
	...svelteKitConfig,
	compilerOptions: { ...svelteKitConfig.compilerOptions, runes: true }
};

const SERVER_ONLY = {
	regex: '^(\\$lib/server|\\$env/(static|dynamic)/private)(/|$)|(^|/)server(/|$)',
	message: 'Pure modules run in the browser too: keep server code and secrets out of them.'
};
const ACCEPTANCE = {
	regex: '(^|/)acceptance(/|$)',
	message: 'Units are below acceptance: the engine may use units, not the other way round.'
};
/** Type imports vanish when compiled, so a pure module may name a server type. */
const restrictImports = (...patterns) => [
	'error',
	{ patterns: patterns.map((p) => ({ ...p, allowTypeImports: true })) }
];

/** Modules shared by the browser, the server and the tests: no DOM, no SvelteKit runtime. */
const PURE_EVERYWHERE = [
	'src/lib/units.ts',
	'src/lib/acceptance/**/*.ts',
	'src/lib/joint-state.ts',
	'src/lib/permissions.ts',
	'src/lib/corrections.ts',
	'src/lib/weld-numbers.ts'
];
const BROWSER_GLOBALS = ['window', 'document', 'navigator', 'localStorage', 'sessionStorage'].map(
	(name) => ({ name, message: 'This module is pure: it runs on the server and in tests too.' })
);

export default defineConfig(
	globalIgnores([
		'build/',
		'.svelte-kit/',
		'static/pdfjs/',
		'test-results/',
		'playwright-report/',
		'bench-results/',
		'drizzle/'
	]),
	js.configs.recommended,
	ts.configs.recommended,
	svelte.configs.recommended,
	{ languageOptions: { globals: { ...globals.browser, ...globals.node } } },
	{
		files: ['**/*.ts', '**/*.svelte', '**/*.svelte.ts'],
		languageOptions: {
			parserOptions: {
				projectService: {
					allowDefaultProject: [
						'drizzle.config.ts',
						'playwright.config.ts',
						'scripts/*.ts',
						'scripts/bench/*.ts'
					]
				},
				extraFileExtensions: ['.svelte'],
				parser: ts.parser,
				svelteConfig,
				tsconfigRootDir: import.meta.dirname
			}
		},
		rules: {
			'@typescript-eslint/no-floating-promises': 'error',
			// A promise-returning handler on an element is fine: Svelte does not wait for it.
			'@typescript-eslint/no-misused-promises': [
				'error',
				{ checksVoidReturn: { attributes: false } }
			],
			'@typescript-eslint/no-unused-vars': [
				'error',
				{ argsIgnorePattern: '^_', varsIgnorePattern: '^_', caughtErrors: 'none' }
			]
		}
	},
	{
		files: ['**/*.svelte', '**/*.svelte.ts'],
		rules: {
			'svelte/button-has-type': 'error',
			// The app is served from the root (no paths.base) and every route is named in the
			// access table, whose matrix test visits it; resolve() on ~45 links would add nothing.
			'svelte/no-navigation-without-resolve': 'off',
			// It flags short-lived locals too (a query string being built, a set inside one
			// function); reactive state here is declared with $state on purpose.
			'svelte/prefer-svelte-reactivity': 'off'
		}
	},
	{
		files: ['src/**/*.{ts,js,svelte}'],
		ignores: [
			'src/lib/permissions.ts',
			'src/auth.ts',
			'src/hooks.server.ts',
			'src/lib/server/users.ts'
		],
		rules: {
			'no-restricted-syntax': [
				'error',
				{
					selector: "MemberExpression[property.name='isAdmin']",
					message:
						'Ask the permissions module (can, canGlobal, isMember) instead of reading isAdmin.'
				}
			]
		}
	},
	{
		files: ['src/lib/**/*.{ts,js,svelte}'],
		ignores: ['src/lib/server/**'],
		rules: { '@typescript-eslint/no-restricted-imports': restrictImports(SERVER_ONLY) }
	},
	{
		files: ['src/lib/units.ts'],
		rules: { '@typescript-eslint/no-restricted-imports': restrictImports(SERVER_ONLY, ACCEPTANCE) }
	},
	{
		files: PURE_EVERYWHERE,
		ignores: ['**/*.test.ts'],
		languageOptions: { globals: { ...globals.es2024 } },
		rules: {
			'no-restricted-globals': ['error', ...BROWSER_GLOBALS],
			'no-restricted-imports': [
				'error',
				{
					patterns: [
						{
							regex: '^\\$app/',
							message: 'This module is pure: SvelteKit’s runtime is not there in tests.'
						}
					]
				}
			]
		}
	},
	{ files: ['**/*.js', '**/*.mjs'], ...ts.configs.disableTypeChecked },
	// TypeScript and svelte-check already report undefined names, with types.
	{ rules: { 'no-undef': 'off' } }
);
