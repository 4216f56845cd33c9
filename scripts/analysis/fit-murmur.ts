/**
 * Fit the murmur screen on both open CirCor folders and rewrite shared/analysis/model/murmur-model.json: a
 * logistic regression over the features of shared/analysis/murmur.ts (labels and choices in murmur-lib.ts), its
 * site and pair thresholds set for TARGET_SENSITIVITY per patient (a visit's call) on out-of-fold scores. Patient-wise cross-validated figures:
 * scripts/analysis/score-murmur.ts. Run: npx tsx scripts/analysis/fit-murmur.ts
 */
import * as fs from 'fs';
import * as path from 'path';
import { fittable, fitScreen, L2_PENALTY, loadExamples, TARGET_SENSITIVITY } from './murmur-lib';

const MODEL_VERSION = '3';
const round = (x: number) => Number(x.toPrecision(6));

function main() {
  const examples = loadExamples();
  const model = fitScreen(examples, MODEL_VERSION);
  const used = examples.filter(fittable);
  const out = {
    version: model.version,
    features: model.features,
    mean: model.mean.map(round),
    scale: model.scale.map(round),
    weights: model.weights.map(round),
    bias: round(model.bias),
    threshold: round(model.threshold),
    pairThreshold: round(model.pairThreshold),
    notes: {
      data: 'CirCor DigiScope v1.0.3, ../shared/data/circor and ../shared/data/circor-train (ODC-By 1.0; Oliveira et al., IEEE JBHI 2022, doi:10.1109/JBHI.2021.3137048)',
      label:
        'positive: the patient has a murmur Present and this site is in #Murmur locations; Unknown patients left out',
      recordings: used.length,
      positives: used.filter((e) => e.label).length,
      l2Penalty: L2_PENALTY,
      thresholdFor: `per-patient (visit) sensitivity ${TARGET_SENSITIVITY} on 5-fold out-of-fold scores, the most Absent patients cleared`,
    },
  };
  const file = path.resolve(__dirname, '../../shared/analysis/model/murmur-model.json');
  fs.writeFileSync(file, `${JSON.stringify(out, null, 2)}\n`);
  console.log(
    `fitted on ${out.notes.recordings} recordings (${out.notes.positives} with a murmur at the site); threshold ${out.threshold}, pair threshold ${out.pairThreshold}; wrote ${path.relative(process.cwd(), file)}`,
  );
}

main();
