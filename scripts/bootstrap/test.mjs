// `npm test`: the same set-up as `npm start` (npm packages, PostgreSQL, plus Debian's Chromium and poppler),
// a private PostgreSQL on its own port, static checks, every jest project, then the end-to-end tests in
// Chromium against the built web export. Ends with one summary line.
import fs from 'node:fs';
import path from 'node:path';
import { spawnSync } from 'node:child_process';
import { startCluster } from './pg.mjs';
import { checkNode, dataDir, ensureNpmPackages, ensureTestBinaries, fail, root, run } from './common.mjs';

const artifacts = path.join(root, 'artifacts');

function jest(projects, outputName, extraArgs = [], env = {}) {
  const outputFile = path.join(artifacts, outputName);
  fs.rmSync(outputFile, { force: true });
  const args = [
    'jest',
    '--selectProjects',
    ...projects,
    '--json',
    `--outputFile=${outputFile}`,
    ...extraArgs,
  ];
  const result = spawnSync('npx', args, { cwd: root, stdio: 'inherit', env: { ...process.env, ...env } });
  let passed = 0;
  let failed = 0;
  let skipped = 0;
  if (fs.existsSync(outputFile)) {
    const report = JSON.parse(fs.readFileSync(outputFile, 'utf8'));
    passed = report.numPassedTests;
    failed = report.numFailedTests + report.numRuntimeErrorTestSuites;
    skipped = report.numPendingTests;
  } else {
    failed = 1;
  }
  return { ok: result.status === 0 && failed === 0, passed, failed, skipped };
}

async function main() {
  checkNode();
  ensureNpmPackages();
  ensureTestBinaries();
  fs.mkdirSync(artifacts, { recursive: true });

  const cluster = await startCluster({
    dataDir: process.env.FOURPOINT_TEST_PG_DIR ?? path.join(dataDir, 'test-pg'),
    port: Number(process.env.TEST_PGPORT ?? 54339),
    database: 'fourpoint_test',
    // A throwaway cluster: speed over crash safety.
    fsync: false,
    log: () => undefined,
  });
  process.on('exit', () => cluster.stop());
  const env = {
    DATABASE_URL: cluster.url,
    FOURPOINT_TEST_PG_URL: cluster.url,
    CI: '1',
    EXPO_NO_TELEMETRY: '1',
  };

  const problems = [];
  for (const [name, args] of [
    ['typecheck', ['run', '--silent', 'typecheck']],
    ['lint', ['run', '--silent', 'lint']],
    ['format', ['run', '--silent', 'format:check']],
  ]) {
    console.log(`\n== ${name}`);
    const result = spawnSync('npm', args, { cwd: root, stdio: 'inherit' });
    if (result.status !== 0) problems.push(name);
  }

  console.log('\n== unit and integration tests (shared, server, app)');
  const unit = jest(['shared', 'server', 'app'], 'jest-unit.json', [], env);

  console.log('\n== web export');
  run('node', ['scripts/build-web.mjs'], { failMessage: 'Building the web app failed (see above).' });

  console.log('\n== end-to-end tests in Chromium');
  const e2e = jest(['e2e'], 'jest-e2e.json', ['--runInBand'], env);

  const passed = unit.passed + e2e.passed;
  const failed = unit.failed + e2e.failed;
  // Tests over the whole open data set skip in a clone without it beside the project; each says so in a
  // "skipped:" line above, and the count keeps the summary honest about what did not run.
  const skipped = unit.skipped + e2e.skipped;
  if (!unit.ok) problems.push('unit tests');
  if (!e2e.ok) problems.push('end-to-end tests');
  console.log(`\nScreenshots and reports: ${path.relative(root, artifacts)}/`);
  if (problems.length) console.log(`Failed: ${problems.join(', ')}`);
  console.log(
    `${passed} passed, ${failed} failed${skipped ? `, ${skipped} skipped (see the "skipped:" lines above)` : ''}`,
  );
  process.exitCode = problems.length ? 1 : 0;
}

main().catch(fail);
