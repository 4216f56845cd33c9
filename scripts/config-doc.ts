// Prints the settings table for DEVELOPERS.md, generated from sync-server/src/config/settings.ts.
// `npm run config:doc -- --check` exits 1 when DEVELOPERS.md's "## Settings" table differs from it.
import fs from 'node:fs';
import path from 'node:path';
import { settingsTable } from '../sync-server/src/config/settings';

const table = settingsTable();
if (!process.argv.includes('--check')) {
  console.log(table);
} else {
  const doc = fs.readFileSync(path.join(__dirname, '../DEVELOPERS.md'), 'utf8');
  const section = doc.split(/^## /m).find((part) => part.startsWith('Settings'));
  const documented = (section ?? '')
    .split('\n')
    .filter((line) => line.startsWith('|'))
    .join('\n');
  if (documented !== table) {
    console.error(
      'DEVELOPERS.md\'s "## Settings" table is out of date: paste the output of `npm run config:doc`.',
    );
    process.exit(1);
  }
}
