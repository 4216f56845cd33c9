/**
 * Patient-wise cross-validation of the murmur screen over both open CirCor folders (174 patients): each fold's
 * regression and threshold are fitted on the other folds' patients only (the threshold from an inner
 * cross-validation among them), then its patients are called possible / unlikely / unsure as a visit is.
 * Run: npx tsx scripts/analysis/score-murmur.ts [--folds N] [--verbose]
 */
import { MURMUR_FEATURES, type MurmurFeatureName } from '../../shared/analysis/murmur';
import { crossValidate, figures, L2_PENALTY, loadExamples, type Example } from './murmur-lib';

/** Area under the ROC curve of one feature over recordings with a known label (0.5: no use alone). */
function auc(examples: Example[], name: MurmurFeatureName): number {
  const rows = examples.filter((e) => e.label !== null && e.features);
  const pos = rows.filter((e) => e.label).map((e) => e.features!.values[name]);
  const neg = rows.filter((e) => !e.label).map((e) => e.features!.values[name]);
  let wins = 0;
  for (const p of pos) for (const n of neg) wins += p > n ? 1 : p === n ? 0.5 : 0;
  return wins / (pos.length * neg.length);
}

function main() {
  const foldArg = process.argv.indexOf('--folds');
  const folds = foldArg > 0 ? Number(process.argv[foldArg + 1]) : 10;
  const verbose = process.argv.includes('--verbose');
  const examples = loadExamples();
  const pct = (x: number) => `${(100 * x).toFixed(1)} %`;
  const results = crossValidate(examples, folds);
  const f = figures(results);
  console.log(
    `murmur screen: ${examples.length} recordings, ${f.present + f.absent + f.unknown} patients ` +
      `(${f.present} Present, ${f.absent} Absent, ${f.unknown} Unknown), ${folds}-fold patient-wise cross-validation`,
  );
  const flagged = Math.round(f.sensitivity * f.present);
  const cleared = Math.round(f.specificity * f.absent);
  console.log(
    `per-patient sensitivity ${pct(f.sensitivity)} (${flagged} of ${f.present}), specificity ${pct(f.specificity)} (${cleared} of ${f.absent})`,
  );
  console.log(`challenge weighted accuracy ${pct(f.weightedAccuracy)}`);
  console.log(`patients called unsure: ${JSON.stringify(f.unsure)}`);
  if (verbose) {
    console.log('single-feature AUC per recording:');
    for (const name of MURMUR_FEATURES) console.log(`  ${name}: ${auc(examples, name).toFixed(3)}`);
    for (const r of results.filter((r) => r.murmur === 'Present' && r.call !== 'possible'))
      console.log(`  missed ${r.patient}: ${r.call}, score ${r.score.toFixed(3)}`);
    console.log(`L2 penalty ${L2_PENALTY}`);
  }
}

main();
