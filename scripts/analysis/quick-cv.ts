import { listRecordings, annotatedHeartRate } from './circor';
import { prepare, fitModel } from './fit-lib';
import { segmentFrames, stateRuns } from '../../shared/analysis/segmentation';
import { scoreSounds, addCounts, emptyCounts, f1 } from '../../shared/analysis/scoring';

const recordings = listRecordings();
const t0 = Date.now();
const prepared = recordings.map(prepare);
console.log('prepared', Date.now() - t0, 'ms');
const patients = [...new Set(recordings.map((r) => r.patient))];
const folds = 6;
let c100 = emptyCounts();
let c60 = emptyCounts();
let hrOk = 0;
let hrN = 0;
for (let fold = 0; fold < folds; fold++) {
  const held = new Set(patients.filter((_, i) => i % folds === fold));
  const t1 = Date.now();
  const model = fitModel(prepared.filter((p) => !held.has(p.recording.patient)), 'cv');
  if (fold === 0) console.log('fit', Date.now() - t1, 'ms', JSON.stringify(model.durations), JSON.stringify(model.orientation));
  for (const p of prepared.filter((p) => held.has(p.recording.patient))) {
    const seg = segmentFrames(p.features, model);
    const sounds = stateRuns(seg.states)
      .filter((r) => r.state === 0 || r.state === 2)
      .map((r) => ({ type: r.state === 0 ? ('S1' as const) : ('S2' as const), startS: r.start / seg.frameRate, endS: r.end / seg.frameRate }));
    const a = scoreSounds(sounds, p.recording.segments, 0.1);
    const b = scoreSounds(sounds, p.recording.segments, 0.06);
    c100 = addCounts(c100, a);
    c60 = addCounts(c60, b);
    const onsets = sounds.filter((s) => s.type === 'S1').map((s) => s.startS);
    const iv = onsets.slice(1).map((o, i) => o - onsets[i]).sort((x, y) => x - y);
    const q = iv.slice(Math.floor(iv.length / 4), Math.ceil((3 * iv.length) / 4));
    const hr = q.length ? 60 / (q.reduce((a, b) => a + b, 0) / q.length) : NaN;
    const truth = annotatedHeartRate(p.recording.segments);
    if (truth) {
      hrN++;
      if (Math.abs(hr - truth) <= 3) hrOk++;
      else console.log('HR miss', p.recording.id, truth.toFixed(1), hr.toFixed(1), 'ac', seg.rate?.heartRateBpm.toFixed(1), 'sys', seg.rate?.systoleS.toFixed(3));
    }
    const rf = f1(a);
    if (rf < 0.9) console.log('low F1', p.recording.id, rf.toFixed(3), p.recording.murmur);
  }
}
console.log('F1@100', f1(c100).toFixed(4), 'F1@60', f1(c60).toFixed(4), 'HR ok', hrOk, '/', hrN);
