/**
 * Fits the segmentation model on the CirCor DigiScope subset (Oliveira et al., IEEE JBHI 2022,
 * doi:10.1109/JBHI.2021.3137048; PhysioNet doi:10.13026/tshs-mw03) and writes
 * shared/analysis/model/hsmm-model.json. Run: npx tsx scripts/analysis/fit.ts
 */
import * as fs from 'fs';
import * as path from 'path';
import { dataDir, listRecordings } from './circor';
import { fitModel, prepare } from './fit-lib';

const MODEL_VERSION = '2026.12-circor24';

function main() {
  const recordings = listRecordings();
  if (recordings.length === 0) throw new Error(`No recordings found in ${dataDir()}`);
  const prepared = recordings.map(prepare);
  const model = fitModel(prepared, MODEL_VERSION);
  const frames = prepared.reduce((sum, p) => sum + p.labels.filter((l) => l >= 0).length, 0);
  const output = {
    ...model,
    training: {
      dataset: 'CirCor DigiScope Phonocardiogram Dataset v1.0.3, training subset (doi:10.13026/tshs-mw03)',
      recordings: recordings.length,
      patients: new Set(recordings.map((r) => r.patient)).size,
      labelledFrames: frames,
      script: 'scripts/analysis/fit.ts',
    },
  };
  const target = path.resolve(__dirname, '../../shared/analysis/model/hsmm-model.json');
  fs.writeFileSync(target, `${JSON.stringify(output, null, 2)}\n`);
  console.log(
    `wrote ${path.relative(process.cwd(), target)} from ${recordings.length} recordings, ${frames} labelled frames`,
  );
}

main();
