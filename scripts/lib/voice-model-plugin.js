/**
 * Serves the offline recogniser's files as static assets under /voice-model/: the English
 * acoustic model and dictionary from node_modules/soundswallower (not committed) and its WASM;
 * Vite bundles the capture worklet itself (src/lib/voice/capture-worklet.ts). Dev:
 * middleware; build: emitted into the client output only. Same-origin files keep the app's
 * content security policy ('self') intact.
 */
import { readFileSync, readdirSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { brotliCompressSync, gzipSync } from 'node:zlib';

export const VOICE_BASE = '/voice-model/';
const MODEL = 'en-us';
// The files the decoder reads (README.txt is documentation only).
const MODEL_FILES = [
	'dict.txt',
	'feat_params.json',
	'mdef',
	'means',
	'noisedict.txt',
	'transition_matrices',
	'sendump',
	'variances'
];

function packageDir() {
	// the package's `exports` hide its files, so find its folder through node_modules
	const require = createRequire(import.meta.url);
	let dir = dirname(require.resolve('soundswallower'));
	while (!readdirSync(dir).includes('package.json')) dir = dirname(dir);
	return dir;
}

/** URL path (under VOICE_BASE) → file on disk. */
function files() {
	const pkg = packageDir();
	const out = new Map();
	for (const f of MODEL_FILES) out.set(`${MODEL}/${f}`, join(pkg, 'model', MODEL, f));
	out.set('soundswallower.wasm', join(pkg, 'soundswallower.web.wasm'));
	// RNNoise is not here: the capture worklet carries it inlined (src/lib/voice/capture-worklet.ts)
	return out;
}

/** @type {Record<string, string>} */
const TYPES = {
	'.json': 'application/json',
	'.wasm': 'application/wasm',
	'.js': 'text/javascript'
};
/** @param {string} name */
const typeOf = (name) =>
	TYPES[name.slice(name.lastIndexOf('.'))] ??
	(name.endsWith('.txt') ? 'text/plain' : 'application/octet-stream');

/** @returns {import('vite').Plugin} */
export function voiceModel() {
	return {
		name: 'benchcall-voice-model',
		configureServer(server) {
			const map = files();
			server.middlewares.use((req, res, next) => {
				const path = (req.url ?? '').split('?')[0];
				if (!path.startsWith(VOICE_BASE)) return next();
				const file = map.get(path.slice(VOICE_BASE.length));
				if (!file) return next();
				res.setHeader('Content-Type', typeOf(file));
				res.end(readFileSync(file));
			});
		},
		generateBundle() {
			// client build only: the server bundle has no use for 10 MB of model
			if (this.environment?.name !== 'client') return;
			for (const [name, file] of files()) {
				const fileName = VOICE_BASE.slice(1) + name;
				const source = readFileSync(file);
				this.emitFile({ type: 'asset', fileName, source });
				// adapter-node precompresses only files with known extensions; the model's
				// extension-less files shrink most (mdef 2.95 MB → about 0.66 MB with brotli)
				if (!/\.[a-z]+$/.test(name)) {
					this.emitFile({
						type: 'asset',
						fileName: fileName + '.br',
						source: brotliCompressSync(source)
					});
					this.emitFile({
						type: 'asset',
						fileName: fileName + '.gz',
						source: gzipSync(source, { level: 9 })
					});
				}
			}
		}
	};
}
