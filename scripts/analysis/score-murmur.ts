/**
 * Patient-wise cross-validation of the murmur screen over both open CirCor folders (174 patients): each fold's
 * regression and thresholds are fitted on the other folds' patients only (the thresholds from an inner
 * cross-validation among them), then its patients are called possible / unlikely / unsure as a visit is
 * (visitMurmurScreen). `--shuffles N` repeats the whole cross-validation over N orders of the patients (the first
 * is the fixed order the tests use), since 35 murmur patients make one fold assignment a noisy figure.
 * Run: npx tsx scripts/analysis/score-murmur.ts [--folds N] [--shuffles N] [--verbose]
 */
import { MURMUR_FEATURES, type MurmurFeatureName } from '../../shared/analysis/murmur';
import {
  crossValidate,
  figures,
  L2_PENALTY,
  loadExamples,
  TARGET_SENSITIVITY,
  type Example,
} from './murmur-lib';

/** Area under the ROC curve of one feature over recordings with a known label (0.5: no use alone). */
function auc(examples: Example[], name: MurmurFeatureName): number {
  const rows = examples.filter((e) => e.label !== null && e.features);
  const pos = rows.filter((e) => e.label).map((e) => e.features!.values[name]);
  const neg = rows.filter((e) => !e.label).map((e) => e.features!.values[name]);
  let wins = 0;
  for (const p of pos) for (const n of neg) wins += p > n ? 1 : p === n ? 0.5 : 0;
  return wins / (pos.length * neg.length);
}

/** FNV-1a of a string as 8 hex digits: a fixed, seedable reordering of the patients. */
function hash(text: string): string {
  let h = 2166136261;
  for (let i = 0; i < text.length; i++) h = Math.imul(h ^ text.charCodeAt(i), 16777619);
  return (h >>> 0).toString(16).padStart(8, '0');
}

/** The same examples with patient ids prefixed so that the folds fall differently (shuffle 0: unchanged). */
function reordered(examples: Example[], shuffle: number): Example[] {
  if (shuffle === 0) return examples;
  return examples.map((e) => ({
    ...e,
    recording: {
      ...e.recording,
      patient: `${hash(`${shuffle}${e.recording.patient}`)}${e.recording.patient}`,
    },
  }));
}

function main() {
  const option = (name: string, fallback: number) => {
    const at = process.argv.indexOf(name);
    return at > 0 ? Number(process.argv[at + 1]) : fallback;
  };
  const folds = option('--folds', 10);
  const shuffles = option('--shuffles', 1);
  const verbose = process.argv.includes('--verbose');
  const examples = loadExamples();
  const pct = (x: number) => `${(100 * x).toFixed(1)} %`;
  const all = { sensitivity: 0, specificity: 0, weightedAccuracy: 0 };
  for (let shuffle = 0; shuffle < shuffles; shuffle++) {
    const results = crossValidate(reordered(examples, shuffle), folds);
    const f = figures(results);
    all.sensitivity += f.sensitivity / shuffles;
    all.specificity += f.specificity / shuffles;
    all.weightedAccuracy += f.weightedAccuracy / shuffles;
    console.log(
      `murmur screen${shuffles > 1 ? ` (order ${shuffle})` : ''}: ${examples.length} recordings, ${f.present + f.absent + f.unknown} patients ` +
        `(${f.present} Present, ${f.absent} Absent, ${f.unknown} Unknown), ${folds}-fold patient-wise cross-validation`,
    );
    const flagged = Math.round(f.sensitivity * f.present);
    const cleared = Math.round(f.specificity * f.absent);
    console.log(
      `per-patient (visit) sensitivity ${pct(f.sensitivity)} (${flagged} of ${f.present}), specificity ${pct(f.specificity)} (${cleared} of ${f.absent})`,
    );
    console.log(`challenge weighted accuracy ${pct(f.weightedAccuracy)}`);
    console.log(`patients called unsure: ${JSON.stringify(f.unsure)}`);
    // the same screens read site by site alone (any site possible), as a flag stored per site reads them
    const alone = figures(results.map((r) => ({ ...r, call: r.siteAlone })));
    console.log(
      `the same, any site possible on its own (no pair rule): sensitivity ${pct(alone.sensitivity)}, specificity ${pct(alone.specificity)}`,
    );
    if (verbose && shuffle === 0)
      for (const r of results.filter((r) => r.murmur === 'Present' && r.call !== 'possible'))
        console.log(
          `  missed ${r.patient}: ${r.call}, site scores ${r.scores.map((s) => s.toFixed(3)).join(', ')}`,
        );
  }
  if (shuffles > 1)
    console.log(
      `mean over ${shuffles} orders: sensitivity ${pct(all.sensitivity)}, specificity ${pct(all.specificity)}, weighted accuracy ${pct(all.weightedAccuracy)}`,
    );
  if (verbose) {
    console.log('single-feature AUC per recording:');
    for (const name of MURMUR_FEATURES) console.log(`  ${name}: ${auc(examples, name).toFixed(3)}`);
    console.log(
      `L2 penalty ${L2_PENALTY}; thresholds for visit sensitivity ${TARGET_SENSITIVITY} on inner folds`,
    );
  }
}

main();
