import { sveltekit } from '@sveltejs/kit/vite';
import tailwindcss from '@tailwindcss/vite';
import { defineConfig } from 'vitest/config';
import { voiceModel } from './scripts/lib/voice-model-plugin.js';

export default defineConfig({
	plugins: [tailwindcss(), sveltekit(), voiceModel()],
	server: { host: '127.0.0.1' },
	// the capture AudioWorklet is loaded as a module and has no importScripts
	worker: { format: 'es' },
	build: {
		rollupOptions: {
			// zod 4.6 writes two explanatory comments where Rollup looks for a @__PURE__ note
			// (INVALID_ANNOTATION): Rollup drops the comment and the bundle is the same. Not ours to
			// fix. onLog, because SvelteKit sets its own onwarn for the client build.
			onLog(level, log, handler) {
				const zod = /[\\/]node_modules[\\/]zod[\\/]/.test(log.id ?? '');
				if (level === 'warn' && log.code === 'INVALID_ANNOTATION' && zod) return;
				handler(level, log);
			}
		}
	},
	test: {
		expect: { requireAssertions: true },
		projects: [
			{
				extends: './vite.config.ts',
				test: {
					name: 'unit',
					environment: 'node',
					include: ['src/**/*.test.ts'],
					exclude: ['src/**/*.db.test.ts'],
					// the voice tests decode speech (RNNoise and the recogniser, 1–3 s a phrase on a
					// loaded 2-core machine): a slow machine is not a failure
					testTimeout: 30_000
				}
			},
			{
				// Integration tests against the real local PostgreSQL that scripts/test.js starts.
				extends: './vite.config.ts',
				test: {
					name: 'db',
					environment: 'node',
					include: ['src/**/*.db.test.ts', 'scripts/**/*.db.test.ts'],
					fileParallelism: false,
					testTimeout: 20_000
				}
			}
		]
	}
});
