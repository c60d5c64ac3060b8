// The map's two import rules (eslint.config.js): route files never read the database, and
// client or shared code never imports server code. Each case is linted as if it were a file at
// that path, so the test fails when the rule is removed, narrowed or broken.
import { resolve } from 'node:path';
import { ESLint } from 'eslint';
import { describe, expect, it } from 'vitest';

const root = resolve(import.meta.dirname, '../..');
const eslint = new ESLint({
	cwd: root,
	// Typed linting needs the file on disk; the import rule does not.
	overrideConfig: [
		{ files: ['**/*.svelte'], languageOptions: { parserOptions: { projectService: false } } }
	]
});

/** The import-rule messages ESLint gives `code` as the file at `path`. */
async function refusals(path: string, code: string): Promise<string[]> {
	const [result] = await eslint.lintText(code, { filePath: resolve(root, path) });
	const fatal = result.messages.filter((m) => m.fatal);
	expect(fatal, path).toEqual([]);
	return result.messages.filter((m) => m.ruleId === 'no-restricted-imports').map((m) => m.message);
}

describe('route files never read the database', () => {
	it('refuses the client, the schema and the drivers in server loads, actions and endpoints', async () => {
		for (const path of [
			'src/routes/(app)/jobs/+page.server.ts',
			'src/routes/(app)/+layout.server.ts',
			'src/routes/api/jobs/[jobId]/history/+server.ts'
		]) {
			for (const from of ['$lib/server/db', '$lib/server/db/schema', 'drizzle-orm', 'postgres']) {
				const found = await refusals(path, `import * as x from '${from}';\nexport { x };\n`);
				expect(found, `${path} ← ${from}`).toEqual([
					expect.stringMatching(/Route files never read the database/)
				]);
			}
		}
	}, 30_000);

	it('lets them call the server modules', async () => {
		const code = `import { getJob } from '$lib/server/bench/job';\nexport { getJob };\n`;
		expect(await refusals('src/routes/api/jobs/[jobId]/steps/+server.ts', code)).toEqual([]);
	});
});

describe('client and shared code never imports server code', () => {
	it('refuses $lib/server, type-only imports too, in pages, components and $lib modules', async () => {
		const cases: [string, string][] = [
			['src/lib/bench/view.ts', `import type { Actor } from '$lib/server/bench/job';`],
			['src/lib/bench/view.ts', `import { db } from '../server/db';`],
			['src/lib/phrase/x.ts', `import { client } from '../../lib/server/db/index';`],
			['src/routes/(app)/bench/+page.ts', `import { requireUser } from '$lib/server/auth';`],
			[
				'src/routes/(app)/bench/step-list.svelte',
				`<script lang="ts">\n\timport type { EntryView } from '$lib/server/log/read';\n\tlet { e }: { e: EntryView } = $props();\n</script>\n\n<p>{e.id}</p>\n`
			]
		];
		for (const [path, code] of cases) {
			const found = await refusals(path, `${code}\n`);
			expect(found.length, `${path}: ${code}`).toBeGreaterThan(0);
			expect(found[0]).toMatch(/never imports server code/);
		}
	}, 30_000);

	it('lets them import shared types and pure modules, and server code import the database', async () => {
		const shared = `import type { EntryView } from '$lib/bench/types';\nimport { formatQuantity } from '$lib/units';\nexport type { EntryView };\nexport { formatQuantity };\n`;
		expect(await refusals('src/lib/components/bench/x.ts', shared)).toEqual([]);
		const server = `import { db } from './db';\nimport { eq } from 'drizzle-orm';\nexport { db, eq };\n`;
		expect(await refusals('src/lib/server/x.ts', server)).toEqual([]);
	});
});
