/** The package ships no types; its Emscripten factory gives the module `denoise.ts` uses. */
declare module '@jitsi/rnnoise-wasm/dist/rnnoise-sync.js' {
	const createRNNWasmModuleSync: () => import('./denoise').RnnoiseModule & {
		ready: Promise<unknown>;
	};
	export default createRNNWasmModuleSync;
}
