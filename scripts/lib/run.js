// Small process helpers for the project's scripts (Node built-ins only).
import { spawn, spawnSync } from 'node:child_process';
import { root } from './config.js';

/** Runs a command, inheriting stdio; resolves with its exit code. */
export function run(cmd, args, opts = {}) {
	return new Promise((resolvePromise) => {
		const child = spawn(cmd, args, { cwd: root, stdio: 'inherit', ...opts });
		child.on('error', (err) => {
			console.error(`Could not run ${cmd}: ${err.message}`);
			resolvePromise(127);
		});
		child.on('exit', (code, signal) => resolvePromise(code ?? (signal ? 1 : 0)));
	});
}

/** Runs a command and exits the script when it fails. */
export async function must(cmd, args, opts = {}) {
	const code = await run(cmd, args, opts);
	if (code !== 0) {
		console.error(`\n✗ ${cmd} ${args.join(' ')} failed (exit ${code}).`);
		process.exit(code || 1);
	}
}

/** Runs a command synchronously and returns its trimmed stdout, or null when it fails. */
export function capture(cmd, args, opts = {}) {
	const r = spawnSync(cmd, args, { cwd: root, encoding: 'utf8', ...opts });
	if (r.error || r.status !== 0) return null;
	return r.stdout.trim();
}

export const isRoot = typeof process.getuid === 'function' && process.getuid() === 0;

export function step(text) {
	console.log(`\n▸ ${text}`);
}
