/** The package ships no types; this is the part of its Emscripten factory Benchcall uses. */
declare module '@jitsi/rnnoise-wasm/dist/rnnoise-sync.js' {
	const createRNNWasmModuleSync: () => {
		ready: Promise<unknown>;
		_rnnoise_create(model: number): number;
		_rnnoise_destroy(state: number): void;
		_rnnoise_process_frame(state: number, out: number, input: number): number;
		_malloc(bytes: number): number;
		_free(pointer: number): void;
		HEAPF32: Float32Array;
	};
	export default createRNNWasmModuleSync;
}
