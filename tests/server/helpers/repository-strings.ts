// Every string the repository itself carries: string and template literals (and JSX text) of its own source
// files, string values of its JSON files, and the value of every `NAME=value` line of any text file (.env-like
// files, shell lines, documentation). node_modules and generated folders are not the project's own.
import fs from 'node:fs';
import path from 'node:path';
import ts from 'typescript';

const ROOT = path.resolve(__dirname, '../../..');
const SOURCE_DIRS = ['app', 'components', 'hooks', 'shared', 'sync-server', 'scripts', 'tests', 'constants'];
const NOT_OURS = new Set(['node_modules', 'dist', '.data', 'artifacts', '.expo', 'coverage', '.git']);
const SCRIPT = /\.(ts|tsx|js|jsx|mjs|cjs)$/;
const BINARY = /\.(png|jpe?g|gif|webp|ico|wav|mp3|m4a|ogg|ttf|otf|woff2?|pdf|zip|gz|sqlite|db)$/i;
const ENV_LINE = /^\s*(?:export\s+)?[A-Za-z_][A-Za-z0-9_]*\s*=\s*(.*?)\s*$/;

function* filesUnder(dir: string): Generator<string> {
  for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
    if (NOT_OURS.has(entry.name)) continue;
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) yield* filesUnder(full);
    else if (entry.isFile() && !BINARY.test(entry.name)) yield full;
  }
}

/** The repository's own text files: the source folders, and the files at its root (package.json, docs, .env*). */
export function repositoryFiles(): string[] {
  const rootFiles = fs
    .readdirSync(ROOT, { withFileTypes: true })
    .filter((e) => e.isFile() && !BINARY.test(e.name) && e.name !== 'package-lock.json')
    .map((e) => path.join(ROOT, e.name));
  const sourceFiles = SOURCE_DIRS.filter((d) => fs.existsSync(path.join(ROOT, d))).flatMap((d) => [
    ...filesUnder(path.join(ROOT, d)),
  ]);
  return [...rootFiles, ...sourceFiles];
}

function scriptLiterals(file: string, text: string, into: Set<string>): void {
  const source = ts.createSourceFile(file, text, ts.ScriptTarget.Latest, false);
  const visit = (node: ts.Node) => {
    if (
      ts.isStringLiteralLike(node) ||
      ts.isTemplateHead(node) ||
      ts.isTemplateMiddle(node) ||
      ts.isTemplateTail(node)
    )
      into.add(node.text);
    else if (ts.isJsxText(node)) into.add(node.text.trim());
    ts.forEachChild(node, visit);
  };
  visit(source);
}

function jsonStrings(value: unknown, into: Set<string>): void {
  if (typeof value === 'string') into.add(value);
  else if (Array.isArray(value)) value.forEach((v) => jsonStrings(v, into));
  else if (value && typeof value === 'object')
    for (const [key, v] of Object.entries(value)) {
      into.add(key);
      jsonStrings(v, into);
    }
}

/** Every distinct non-empty string found, each also with surrounding quotes removed where an env line had them. */
export function repositoryStrings(): Set<string> {
  const found = new Set<string>();
  for (const file of repositoryFiles()) {
    const text = fs.readFileSync(file, 'utf8');
    if (text.includes('\u0000')) continue;
    if (SCRIPT.test(file)) scriptLiterals(file, text, found);
    if (file.endsWith('.json')) {
      try {
        jsonStrings(JSON.parse(text), found);
      } catch {
        /* JSON with comments (tsconfig): its env-like lines and literals are still read below */
      }
    }
    for (const line of text.split('\n')) {
      const value = ENV_LINE.exec(line)?.[1];
      if (value) found.add(value.replace(/^(['"`])(.*)\1;?$/, '$2'));
    }
  }
  found.delete('');
  return found;
}
