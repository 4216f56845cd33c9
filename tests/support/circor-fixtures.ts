import fs from 'node:fs';
import path from 'node:path';

/**
 * The few CirCor DigiScope recordings vendored in tests/fixtures/circor (Oliveira et al., IEEE JBHI 2022,
 * doi:10.1109/JBHI.2021.3137048; PhysioNet doi:10.13026/tshs-mw03; ODC-By 1.0, see its README and LICENSE.txt).
 * Tests that need only a recording or two read them from here, so they run in a fresh clone without the open
 * data folder beside the project.
 */
export const circorFixtureDir = path.resolve(__dirname, '../fixtures/circor');

/** Path of a vendored file, e.g. `circorFixture('36327_MV.wav')`; throws, naming the folder, when it is absent. */
export function circorFixture(file: string): string {
  const location = path.join(circorFixtureDir, file);
  if (!fs.existsSync(location))
    throw new Error(
      `${file} is not among the vendored recordings in tests/fixtures/circor: use one listed in its README, ` +
        'or copy the record (.wav, .tsv, .hea and the patient .txt) there and list it.',
    );
  return location;
}
