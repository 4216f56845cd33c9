// The clip worker thread's entry. Plain JavaScript so Node can start it as it is, under tsx (npm start) and under
// jest alike; it registers tsx to load the TypeScript job. Under tsx the loader is already there and registering
// again is harmless.
require('tsx/cjs');
const { parentPort } = require('node:worker_threads');
const { openStagedClip } = require('./open-clip-job.ts');

parentPort.on('message', async ({ id, job }) => {
  try {
    parentPort.postMessage({ id, result: await openStagedClip(job) });
  } catch (error) {
    parentPort.postMessage({ id, error: error instanceof Error ? error.message : String(error) });
  }
});
