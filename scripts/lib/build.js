// Builds the app with Vite when the sources changed since the last build.
import { createHash } from 'node:crypto';
import { existsSync, readFileSync, readdirSync, statSync, writeFileSync } from 'node:fs';
import { join, relative } from 'node:path';
import { root } from './config.js';
import { must, step } from './run.js';

const inputs = [
	'src',
	'static',
	'svelte.config.js',
	'vite.config.ts',
	'tailwind.config.ts',
	'package-lock.json'
];
const stampFile = join(root, 'build', '.benchcall-stamp');

function walk(path, out) {
	const st = statSync(path);
	if (st.isDirectory()) {
		for (const name of readdirSync(path).sort()) walk(join(path, name), out);
	} else {
		out.push(`${relative(root, path)}:${st.size}:${st.mtimeMs}`);
	}
}

/** A fingerprint of everything the build reads: names, sizes and modification times. */
export function sourceStamp() {
	const lines = [];
	for (const input of inputs) {
		const path = join(root, input);
		if (existsSync(path)) walk(path, lines);
	}
	return createHash('sha256').update(lines.join('\n')).digest('hex');
}

export async function ensureBuild({ force = false } = {}) {
	const stamp = sourceStamp();
	const current = existsSync(stampFile) ? readFileSync(stampFile, 'utf8') : '';
	if (!force && current === stamp && existsSync(join(root, 'build', 'index.js'))) return false;
	step('Building the app (vite build)');
	// the generated tsconfig first: on a fresh clone the config's and the capture worklet's
	// bundling read tsconfig.json, which extends it, and warned that it was missing
	await must(join(root, 'node_modules', '.bin', 'svelte-kit'), ['sync']);
	await must(join(root, 'node_modules', '.bin', 'vite'), ['build', '--logLevel', 'warn']);
	writeFileSync(stampFile, stamp);
	return true;
}
