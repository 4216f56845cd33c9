import { crossValidate, figures, loadExamples, type Figures } from '@/scripts/analysis/murmur-lib';
import { heldOutDataDir } from '@/scripts/analysis/circor';
import { describeWithOpenData } from '@/tests/support/open-data';

/*
 * The murmur screen against the murmur labels of the open CirCor DigiScope data (v1.0.3; Oliveira et al., IEEE
 * JBHI 2022, doi:10.1109/JBHI.2021.3137048; PhysioNet doi:10.13026/tshs-mw03), both folders, 174 patients,
 * 10-fold patient-wise cross-validation (no patient is scored by a screen fitted on them). Per-patient call as a
 * visit's (visitMurmurScreen: possible if any site is, or if two sites are borderline). Weighted accuracy as in the George B. Moody PhysioNet Challenge 2022 (Reyna et
 * al., PLOS Digital Health 2023). Floors sit just under the figures measured when the screen was fitted
 * (scripts/analysis/score-murmur.ts prints them), so a regression fails.
 */
describeWithOpenData(
  'murmur screen, patient-wise cross-validation on the open CirCor data',
  () => {
    let f: Figures;
    beforeAll(() => {
      f = figures(crossValidate(loadExamples(), 10));
    });

    test('when every patient is scored by a screen fitted without them, then at least 94 % of murmurs are flagged (measured 94.3 %, 33 of 35)', () => {
      expect(f.present).toBe(35);
      expect(f.sensitivity).toBeGreaterThanOrEqual(0.94);
    });

    test('when patients without a murmur are scored, then at least 83 % are called unlikely (measured 83.5 %, 111 of 133)', () => {
      expect(f.absent).toBe(133);
      expect(f.specificity).toBeGreaterThanOrEqual(0.83);
    });

    test('when scored as in the 2022 challenge (Present 5, Unknown 3, Absent 1), then the weighted accuracy is at least 84 % (measured 84.7 %)', () => {
      expect(f.weightedAccuracy).toBeGreaterThanOrEqual(0.84);
    });
    // the second folder sits beside the first: checking it covers both
  },
  heldOutDataDir(),
);
