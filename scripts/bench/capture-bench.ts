// Time from the end of a take to its analysed trace, the part the browser spends in the analysis worker: the
// built worker (dist/workers/analysis.js) in Debian's Chromium, on CirCor DigiScope clips (Oliveira et al.,
// IEEE JBHI 2022, doi:10.1109/JBHI.2021.3137048) at the app's 8 kHz capture rate, warmed up as the app warms it.
// The target is 300 ms from the end of a recording to the trace on screen (issue 4); the end-to-end figure of a
// real take is written by tests/e2e/capture.e2e.ts to artifacts/capture-timings.json.
import fs from 'node:fs';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import { chromium } from 'playwright-core';
import { resamplePoly } from '@/shared/analysis/resample';
import { listRecordings, readSamples } from '@/scripts/analysis/circor';

const root = path.resolve(__dirname, '../..');
const workerFile = path.join(root, 'dist/workers/analysis.js');
const budgetMs = 300;
const takeRate = 8000;

function clips(count: number, seconds: number): number[][] {
  return listRecordings()
    .slice(0, count)
    .map((recording) => {
      const wav = readSamples(recording);
      const up = resamplePoly(wav.samples, takeRate / wav.sampleRate, 1);
      return Array.from(up.subarray(0, Math.min(up.length, takeRate * seconds)));
    });
}

const inBrowser = `async ({ inputs, rate }) => {
  const worker = new Worker('/workers/analysis.js');
  let id = 0;
  const run = (samples) => new Promise((resolve, reject) => {
    const started = performance.now();
    worker.onmessage = (e) => (e.data.ok ? resolve(performance.now() - started) : reject(new Error(e.data.message)));
    const copy = samples.slice();
    worker.postMessage({ id: ++id, samples: copy, sampleRate: rate, points: 600 }, [copy.buffer]);
  });
  const arrays = inputs.map((a) => Float32Array.from(a));
  for (let i = 0; i < 6; i++) await run(arrays[i % arrays.length]);
  const out = [];
  for (let round = 0; round < 3; round++) for (const a of arrays) out.push(await run(a));
  worker.terminate();
  return out;
}`;

function percentile(values: number[], p: number): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))]!;
}

async function main(): Promise<void> {
  if (!fs.existsSync(workerFile))
    throw new Error('dist/workers/analysis.js is missing: run node scripts/build-web.mjs first.');
  const server = http
    .createServer((req, res) => {
      if (req.url === '/workers/analysis.js') {
        res.writeHead(200, { 'content-type': 'text/javascript' });
        res.end(fs.readFileSync(workerFile));
      } else {
        res.writeHead(200, { 'content-type': 'text/html' });
        res.end('<!doctype html><title>bench</title>');
      }
    })
    .listen(0, '127.0.0.1');
  await new Promise((r) => server.once('listening', r));
  const url = `http://127.0.0.1:${(server.address() as AddressInfo).port}/`;
  const browser = await chromium.launch({
    executablePath: '/usr/bin/chromium',
    args: ['--headless', '--no-sandbox', '--disable-gpu'],
  });
  try {
    const page = await browser.newPage();
    await page.goto(url);
    for (const seconds of [10, 15, 30]) {
      const inputs = clips(12, seconds);
      // Sent as source text: tsx would otherwise wrap the function in helpers the page does not have.
      const times = (await page.evaluate(
        `(${inBrowser})(${JSON.stringify({ inputs, rate: takeRate })})`,
      )) as number[];
      const median = percentile(times, 50);
      const p95 = percentile(times, 95);
      console.log(
        `analysis worker, ${seconds} s take at 8 kHz (${times.length} runs): median ${median.toFixed(0)} ms, ` +
          `p95 ${p95.toFixed(0)} ms, max ${Math.max(...times).toFixed(0)} ms; p95 / ${budgetMs} ms budget = ${(p95 / budgetMs).toFixed(2)}`,
      );
    }
  } finally {
    await browser.close();
    server.close();
  }
}

main().catch((error: unknown) => {
  console.error(error);
  process.exit(1);
});
