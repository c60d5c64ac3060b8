// eslint-disable-next-line @typescript-eslint/ban-ts-comment -- the AudioWorkletGlobalScope has no TypeScript lib here
// @ts-nocheck
/* global AudioWorkletProcessor, registerProcessor, sampleRate */
// Audio capture for the offline recogniser: runs on the audio thread, passes the microphone's
// samples (first channel) to the page in blocks of about 100 ms. Served as a plain same-origin
// file by scripts/lib/voice-model-plugin.js, so the content security policy needs no change.
class BenchcallCapture extends AudioWorkletProcessor {
	constructor() {
		super();
		this.block = new Float32Array(Math.round(sampleRate / 10));
		this.filled = 0;
	}
	process(inputs) {
		const channel = inputs[0] && inputs[0][0];
		if (channel) {
			let i = 0;
			while (i < channel.length) {
				const n = Math.min(channel.length - i, this.block.length - this.filled);
				this.block.set(channel.subarray(i, i + n), this.filled);
				this.filled += n;
				i += n;
				if (this.filled === this.block.length) {
					this.port.postMessage(this.block.slice());
					this.filled = 0;
				}
			}
		}
		return true;
	}
}
registerProcessor('benchcall-capture', BenchcallCapture);
