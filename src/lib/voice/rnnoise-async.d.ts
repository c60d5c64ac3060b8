// The browser build of RNNoise that fetches its WASM (112 kB, served with the voice model by
// scripts/lib/voice-model-plugin.js) rather than carrying it inlined (1.9 MB of script).
declare module '@jitsi/rnnoise-wasm/dist/rnnoise.js' {
	const createRNNWasmModule: (options?: {
		locateFile?: (path: string) => string;
		/** Emscripten's hook for a module that instantiates its WASM itself (the worklet). */
		instantiateWasm?: (
			imports: WebAssembly.Imports,
			receive: (instance: WebAssembly.Instance) => void
		) => object;
	}) => Promise<import('./denoise').RnnoiseModule & { ready: Promise<unknown> }>;
	export default createRNNWasmModule;
}
