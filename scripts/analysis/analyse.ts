/**
 * Usage: npm run --silent analyse -- [--json] [--site mitral|tricuspid|aortic|pulmonic] FILE...
 * With --json, one JSON object per file per line and nothing else on stdout.
 */
import * as fs from 'fs';
import * as path from 'path';
import { AnalysisError, analyseWav, type AnalysisResult, type SiteCode } from '../../shared/analysis';

const SITES: SiteCode[] = ['mitral', 'tricuspid', 'aortic', 'pulmonic'];

interface Arguments {
  json: boolean;
  site?: SiteCode;
  files: string[];
}

function parseArguments(argv: string[]): Arguments {
  const parsed: Arguments = { json: false, files: [] };
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i];
    if (arg === '--json') parsed.json = true;
    else if (arg === '--site') {
      const site = argv[++i] as SiteCode;
      if (!SITES.includes(site)) throw new Error(`--site takes one of ${SITES.join(', ')}`);
      parsed.site = site;
    } else if (arg === '--') continue;
    else parsed.files.push(arg);
  }
  return parsed;
}

const round = (value: number | null, digits: number) =>
  value === null ? null : Number(value.toFixed(digits));

function roundMetrics(metrics: AnalysisResult['metrics']) {
  const out: Record<string, unknown> = {};
  for (const [key, value] of Object.entries(metrics)) {
    if (typeof value === 'number') out[key] = round(value, 4);
    else if (key === 'beats' && Array.isArray(value)) {
      out[key] = value.map((beat) =>
        Object.fromEntries(
          Object.entries(beat).map(([k, v]) => [k, typeof v === 'number' ? round(v, 4) : v]),
        ),
      );
    } else out[key] = value;
  }
  return out;
}

function toJsonLine(file: string, result: AnalysisResult) {
  return {
    file,
    sampleRate: result.sampleRate,
    durationS: round(result.durationS, 4),
    heartRateBpm: round(result.heartRateBpm, 2),
    sounds: result.sounds.map((s) => ({ type: s.type, startS: round(s.startS, 4), endS: round(s.endS, 4) })),
    metrics: roundMetrics(result.metrics),
    quality: result.quality,
    screen: { ...result.screen, score: round(result.screen.score, 4) },
    analysisVersion: result.analysisVersion,
  };
}

function errorOf(error: unknown): { code: string; message: string } {
  if (error instanceof AnalysisError) return { code: error.code, message: error.message };
  const nodeError = error as NodeJS.ErrnoException;
  if (nodeError?.code === 'ENOENT') return { code: 'not_found', message: 'No such file.' };
  if (nodeError?.code === 'EISDIR') return { code: 'not_a_file', message: 'This is a directory.' };
  if (nodeError?.code) return { code: 'unreadable', message: nodeError.message };
  return { code: 'internal', message: error instanceof Error ? error.message : String(error) };
}

const fmt = (value: number | null, digits = 0) => (value === null ? '–' : value.toFixed(digits));

function main(): number {
  let args: Arguments;
  try {
    args = parseArguments(process.argv.slice(2));
  } catch (error) {
    process.stderr.write(`${(error as Error).message}\n`);
    return 2;
  }
  if (args.files.length === 0) {
    process.stderr.write('Usage: npm run --silent analyse -- [--json] [--site SITE] FILE...\n');
    return 2;
  }
  const base = process.env.INIT_CWD ?? process.cwd();
  let failed = 0;
  if (!args.json)
    process.stdout.write(
      ['file', 'bpm', 'S1', 'S2', 'cycles', 'sys/dia', 'SDNN ms', 'verdict', 'murmur'].join('\t') + '\n',
    );
  for (const file of args.files) {
    try {
      const bytes = new Uint8Array(fs.readFileSync(path.resolve(base, file)));
      const result = analyseWav(bytes, { site: args.site });
      if (args.json) process.stdout.write(`${JSON.stringify(toJsonLine(file, result))}\n`);
      else {
        const m = result.metrics;
        const count = (type: string) => result.sounds.filter((s) => s.type === type).length;
        const reasons = result.quality.reasons.map((r) => r.code).join(',');
        process.stdout.write(
          [
            file,
            fmt(result.heartRateBpm),
            count('S1'),
            count('S2'),
            m.usableCycles,
            fmt(m.systoleDiastoleRatio, 2),
            fmt(m.sdnnMs),
            `${result.quality.verdict}${reasons ? ` (${reasons})` : ''}`,
            `${result.screen.murmur} (${result.screen.score.toFixed(2)})`,
          ].join('\t') + '\n',
        );
      }
    } catch (error) {
      failed++;
      const problem = errorOf(error);
      if (args.json) process.stdout.write(`${JSON.stringify({ file, error: problem })}\n`);
      else process.stdout.write(`${file}\terror: ${problem.code}: ${problem.message}\n`);
    }
  }
  return failed ? 1 : 0;
}

process.exitCode = main();
