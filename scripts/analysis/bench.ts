/**
 * Analysis speed on the development recordings, one core, warm: audio seconds analysed per second of compute
 * (× real time) and milliseconds per 30 s of audio, and how that stands against the aim of 2000× real time. Run: npx tsx scripts/analysis/bench.ts [--rounds N]
 */
import { analysePcm } from '../../shared/analysis/analyse';
import { listRecordings, readSamples } from './circor';

function main() {
  const roundsArg = process.argv.indexOf('--rounds');
  const rounds = roundsArg > 0 ? Number(process.argv[roundsArg + 1]) : 5;
  const clips = listRecordings().map((r) => readSamples(r));
  const audioS = clips.reduce((sum, c) => sum + c.samples.length / c.sampleRate, 0);
  for (const clip of clips) analysePcm(clip.samples, clip.sampleRate);
  const timings: number[] = [];
  const cpuTimings: number[] = [];
  for (let round = 0; round < rounds; round++) {
    const started = process.hrtime.bigint();
    const cpuStarted = process.cpuUsage();
    for (const clip of clips) analysePcm(clip.samples, clip.sampleRate);
    const cpu = process.cpuUsage(cpuStarted);
    timings.push(Number(process.hrtime.bigint() - started) / 1e9);
    cpuTimings.push((cpu.user + cpu.system) / 1e6);
  }
  const best = Math.min(...timings);
  const median = [...timings].sort((a, b) => a - b)[timings.length >> 1];
  const memory = process.memoryUsage();
  console.log(
    `analysis bench: ${clips.length} clips, ${audioS.toFixed(0)} s of audio, ${rounds} warm rounds`,
  );
  console.log(
    `best   ${(audioS / best).toFixed(0)}× real time, ${((best / audioS) * 30 * 1000).toFixed(2)} ms per 30 s clip`,
  );
  console.log(
    `median ${(audioS / median).toFixed(0)}× real time, ${((median / audioS) * 30 * 1000).toFixed(2)} ms per 30 s clip`,
  );
  // on a shared machine the wall clock includes time spent waiting for the core; CPU time does not
  const cpuBest = Math.min(...cpuTimings);
  console.log(
    `cpu    ${(audioS / cpuBest).toFixed(0)}× real time, ${((cpuBest / audioS) * 30 * 1000).toFixed(2)} ms per 30 s clip (process CPU time, best round)`,
  );
  // the aim of the analysis issue: the whole analysis, murmur screen included, at 2000× real time or more
  const aim = 2000;
  console.log(
    `aim    ${aim}× real time: best round ${(audioS / best / aim).toFixed(2)} of it (wall clock), ${(audioS / cpuBest / aim).toFixed(2)} (CPU time)`,
  );
  console.log(`heap used ${(memory.heapUsed / 1e6).toFixed(0)} MB`);
}

main();
