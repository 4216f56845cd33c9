// The Content-Security-Policy on every answer of the app (OWASP ASVS 4.0.3 V14.4.3: a CSP that mitigates XSS;
// V14.4.7: no framing by other sites). tests/e2e/csp.e2e.ts proves in Chromium that the app runs under it.
import { createHash } from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { inlineScriptHashes } from '@/sync-server/src/middleware/content-security-policy';
import { makeSiblingApp, makeTestContext } from './helpers/test-app';

const ctx = makeTestContext();
afterAll(() => ctx.close());

const registration = "navigator.serviceWorker.register('/sw.js');";
const webDist = fs.mkdtempSync(path.join(os.tmpdir(), 'fourpoint-csp-'));
const indexHtml = path.join(webDist, 'index.html');
fs.writeFileSync(
  indexHtml,
  `<!doctype html><html><head><title>Fourpoint shell</title><script>${registration}</script></head>` +
    '<body><div id="root"></div><script src="/_expo/static/js/web/entry.js" defer></script></body></html>',
);
fs.mkdirSync(path.join(webDist, 'workers'));
fs.writeFileSync(path.join(webDist, 'workers', 'analysis.js'), 'self.onmessage = () => undefined;');
const app = makeSiblingApp(ctx, { webDist });

/** The hash source of a script body as CSP Level 3 § 2.3.1 defines it: base64 of the SHA-256 of its UTF-8. */
const hashSource = (body: string) =>
  `'sha256-${createHash('sha256').update(Buffer.from(body, 'utf8')).digest('base64')}'`;

/** The policy as directive name → source list (CSP Level 3 § 2.2.1 parsing, without the edge cases). */
function directives(header: string | undefined): Map<string, string[]> {
  expect(header).toBeDefined();
  const out = new Map<string, string[]>();
  for (const part of header!.split(';')) {
    const [name, ...sources] = part.trim().split(/\s+/);
    if (name) out.set(name.toLowerCase(), sources);
  }
  return out;
}

function expectStrictPolicy(policy: Map<string, string[]>): void {
  expect(policy.get('default-src')).toEqual(["'self'"]);
  const scriptSrc = policy.get('script-src') ?? [];
  expect(scriptSrc).toContain("'self'");
  expect(scriptSrc).not.toContain("'unsafe-inline'");
  expect(scriptSrc).not.toContain("'unsafe-eval'");
  expect(scriptSrc.filter((source) => !source.startsWith("'sha256-"))).toEqual([
    "'self'",
    "'wasm-unsafe-eval'",
  ]);
  expect(policy.get('object-src')).toEqual(["'none'"]);
  expect(policy.get('base-uri')).toEqual(["'self'"]);
  expect(policy.get('frame-ancestors')).toEqual(["'none'"]);
  expect(policy.get('form-action')).toEqual(["'self'"]);
  // Nothing may be loaded from another origin or any scheme wide open.
  for (const [name, sources] of policy) {
    for (const source of sources)
      expect(`${name} ${source}`).not.toMatch(/ (\*|https?:|http:\/\/|https:\/\/)/);
  }
}

describe('the Content-Security-Policy', () => {
  test('when the shell is loaded, then it carries the strict policy with the hash of its inline script', async () => {
    for (const url of ['/', '/practitioner/sessions/123']) {
      const res = await request(app).get(url);
      expect(res.status).toBe(200);
      expect(res.text).toContain('Fourpoint shell');
      const policy = directives(res.headers['content-security-policy']);
      expectStrictPolicy(policy);
      expect(policy.get('script-src')).toContain(hashSource(registration));
    }
  });

  test('when a static file or an API answer is sent, then it carries the same policy', async () => {
    const shell = await request(app).get('/');
    for (const url of ['/workers/analysis.js', '/api/health', '/api/not-a-route']) {
      const res = await request(app).get(url);
      expect(res.headers['content-security-policy']).toBe(shell.headers['content-security-policy']);
    }
  });

  test('when index.html is rebuilt with another inline script, then the policy follows it without a restart', async () => {
    const before = fs.readFileSync(indexHtml, 'utf8');
    const rebuilt = "navigator.serviceWorker.register('/sw.js', { scope: '/' });";
    try {
      fs.writeFileSync(indexHtml, before.replace(registration, rebuilt));
      // A later modification time, even on file systems with coarse timestamps.
      const later = new Date(Date.now() + 5_000);
      fs.utimesSync(indexHtml, later, later);
      const policy = directives((await request(app).get('/')).headers['content-security-policy']);
      expect(policy.get('script-src')).toContain(hashSource(rebuilt));
      expect(policy.get('script-src')).not.toContain(hashSource(registration));
    } finally {
      fs.writeFileSync(indexHtml, before);
    }
  });

  test('when no web export is served, then the API still answers under the strict policy', async () => {
    const res = await request(ctx.app).get('/api/health');
    expectStrictPolicy(directives(res.headers['content-security-policy']));
  });
});

describe('inlineScriptHashes', () => {
  test('when the example script of the CSP specification is hashed, then the hash is the one it gives', () => {
    // W3C Content Security Policy Level 3, § 2.3.1 (hash-source example).
    expect(inlineScriptHashes("<script>alert('Hello, world.');</script>")).toEqual([
      "'sha256-qznLcsROx4GACP2dm0UCKCzCG+HiZ1guq6ZZDob/Tng='",
    ]);
  });

  test('when a page has inline and external scripts, then only the inline bodies are hashed', () => {
    const html =
      '<script src="/a.js"></script><script>one()</script><SCRIPT type="module">two()</SCRIPT><script></script>';
    expect(inlineScriptHashes(html)).toEqual([hashSource('one()'), hashSource('two()')]);
  });
});
