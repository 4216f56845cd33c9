// Runs on the audio thread and hands the raw samples of the take over in blocks of 2048 (recorder.ts).
// It is its own file, bundled by scripts/build-worker.mjs into dist/workers/recorder-tap.js, because the
// Content-Security-Policy lets the audio worklet load scripts only from this origin, not from a blob: URL.

// The audio-worklet global scope is not in TypeScript's DOM library; these are the two names used here.
declare class AudioWorkletProcessor {
  readonly port: MessagePort;
}
declare function registerProcessor(name: string, processor: typeof AudioWorkletProcessor): void;

class FourpointTap extends AudioWorkletProcessor {
  private block = new Float32Array(2048);
  private filled = 0;

  process(inputs: Float32Array[][]): boolean {
    const channel = inputs[0]?.[0];
    if (channel) {
      for (let i = 0; i < channel.length; i++) {
        this.block[this.filled++] = channel[i] ?? 0;
        if (this.filled === this.block.length) {
          this.port.postMessage(this.block);
          this.block = new Float32Array(2048);
          this.filled = 0;
        }
      }
    }
    return true;
  }
}

registerProcessor('fourpoint-tap', FourpointTap);
