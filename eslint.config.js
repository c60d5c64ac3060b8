import js from '@eslint/js';
import prettier from 'eslint-config-prettier';
import svelte from 'eslint-plugin-svelte';
import globals from 'globals';
import ts from 'typescript-eslint';
import svelteConfig from './svelte.config.js';

// Server code: $lib/server, *.server modules, endpoints, the server hooks, and the app's ambient
// types (App.Locals names the session's types).
const serverFiles = [
	'src/app.d.ts',
	'src/lib/server/**',
	'src/**/*.server.{ts,js}',
	'src/routes/**/+server.{ts,js}'
];
const clientMessage =
	'Client and shared code never imports server code: put shared types and pure rules in $lib/<area>.';
const routeMessage =
	'Route files never read the database: call a function of a module in $lib/server instead.';
const clientOnly = {
	regex: '^(\\$lib/server|(\\.\\./)+(lib/)?server|\\./server)(/|$)',
	message: clientMessage
};
/** The database client, schema and drivers: only $lib/server (and scripts) reach them. */
const databaseImports = (message) => [
	{ regex: '^(\\$lib/server/db|drizzle-orm|postgres)(/|$)', message }
];

export default ts.config(
	{
		ignores: ['build/', '.svelte-kit/', 'drizzle/', '.data/', 'test-results/', 'playwright-report/']
	},
	js.configs.recommended,
	...ts.configs.recommended,
	...svelte.configs.recommended,
	prettier,
	...svelte.configs.prettier,
	{
		languageOptions: { globals: { ...globals.browser, ...globals.node } },
		rules: {
			'no-undef': 'off',
			// Benchcall is served from the root (no paths.base), so plain hrefs are correct.
			'svelte/no-navigation-without-resolve': 'off',
			'@typescript-eslint/no-unused-vars': [
				'error',
				{ argsIgnorePattern: '^_', varsIgnorePattern: '^_' }
			]
		}
	},
	// The map's two rules (DEVELOPERS.md). SvelteKit already fails a build whose client code
	// imports a value from $lib/server or a *.server module, but not a type-only import, a pure
	// $lib module no page uses yet, nor a server route file that reads the database itself.
	{
		files: ['src/**/*.{ts,js,svelte}'],
		ignores: serverFiles,
		rules: {
			'no-restricted-imports': [
				'error',
				{ patterns: [clientOnly, ...databaseImports(clientMessage)] }
			]
		}
	},
	{
		files: ['src/routes/**/*.server.{ts,js}', 'src/routes/**/+server.{ts,js}'],
		rules: {
			'no-restricted-imports': ['error', { patterns: databaseImports(routeMessage) }]
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
