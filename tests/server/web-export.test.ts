import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import os from 'node:os';
import path from 'node:path';
import zlib from 'node:zlib';
import request from 'supertest';
import { makeSiblingApp, makeTestContext } from './helpers/test-app';

const ctx = makeTestContext();

// A small export shaped like Expo's: content-hashed bundles and assets, an unhashed worker and service worker.
const outside = fs.mkdtempSync(path.join(os.tmpdir(), 'fourpoint-web-'));
const webDist = path.join(outside, 'dist');
const entryJs = '_expo/static/js/web/entry-b32cd95fbb88b0672f405fe99502caf6.js';
const operatorChunk = '_expo/static/js/web/capture-0123456789abcdef0123456789abcdef.js';
const wasm = 'assets/wa-sqlite.7ca566fbbc2ec2a172c5aefa63a20f4b.wasm';
const files: Record<string, Buffer> = {
  'index.html': Buffer.from(
    `<!doctype html><title>Fourpoint shell</title>${'<meta name="x" content="padding">'.repeat(60)}`,
  ),
  [entryJs]: Buffer.from(`var bundle = [${'"the same words again", '.repeat(400)}];`),
  [operatorChunk]: Buffer.from(`var capture = [${'"capture screen", '.repeat(300)}];`),
  [wasm]: Buffer.concat([Buffer.from([0x00, 0x61, 0x73, 0x6d, 0x01, 0, 0, 0]), Buffer.alloc(4096)]),
  'workers/analysis.js': Buffer.from(`self.onmessage = () => {}; // ${'analysis '.repeat(200)}`),
  'sw.js': Buffer.from(`self.addEventListener('fetch', () => {}); // ${'precache '.repeat(200)}`),
  'tiny.js': Buffer.from('1;'),
  '.env': Buffer.from('SECRET=1'),
};
for (const [name, bytes] of Object.entries(files)) {
  fs.mkdirSync(path.dirname(path.join(webDist, name)), { recursive: true });
  fs.writeFileSync(path.join(webDist, name), bytes);
}
fs.writeFileSync(path.join(outside, 'secret.txt'), 'outside the export');
// The build step itself writes the .br and .gz files the server picks from.
const compression = spawnSync(process.execPath, ['scripts/compress-web.mjs', webDist], {
  cwd: path.resolve(__dirname, '../..'),
  encoding: 'utf8',
});
if (compression.status !== 0) throw new Error(`compress-web.mjs failed: ${compression.stderr}`);

const app = makeSiblingApp(ctx, { webDist });
let server: http.Server;
let port: number;
beforeAll(async () => {
  server = http.createServer(app);
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  port = (server.address() as AddressInfo).port;
});
afterAll(async () => {
  await new Promise((resolve) => server.close(resolve));
  await ctx.close();
});

interface RawResponse {
  status: number;
  headers: http.IncomingHttpHeaders;
  body: Buffer;
}

/** The bytes exactly as sent (supertest would decompress them), for a path sent as written. */
function rawGet(requestPath: string, acceptEncoding?: string): Promise<RawResponse> {
  return new Promise((resolve, reject) => {
    const headers = acceptEncoding === undefined ? {} : { 'Accept-Encoding': acceptEncoding };
    http
      .get({ host: '127.0.0.1', port, path: requestPath, headers }, (res) => {
        const chunks: Buffer[] = [];
        res.on('data', (chunk: Buffer) => chunks.push(chunk));
        res.on('end', () =>
          resolve({ status: res.statusCode ?? 0, headers: res.headers, body: Buffer.concat(chunks) }),
        );
      })
      .on('error', reject);
  });
}

const expectIsolated = (headers: Record<string, unknown>) => {
  expect(headers['cross-origin-opener-policy']).toBe('same-origin');
  expect(headers['cross-origin-embedder-policy']).toBe('require-corp');
  expect(headers['cross-origin-resource-policy']).toBe('same-origin');
};

// The header Chromium sends to secure origins; it lists gzip first, so ties must go to the server's order.
const CHROMIUM_ACCEPT_ENCODING = 'gzip, deflate, br, zstd';

describe('serving the web export', () => {
  test('when / is asked for, then the shell comes back cross-origin isolated', async () => {
    const res = await request(app).get('/');
    expect(res.status).toBe(200);
    expect(res.text).toContain('Fourpoint shell');
    expectIsolated(res.headers);
  });

  test('when a .wasm file is asked for, then it is served as application/wasm', async () => {
    const res = await rawGet(`/${wasm}`, CHROMIUM_ACCEPT_ENCODING);
    expect(res.status).toBe(200);
    // WebAssembly JS API §"compileStreaming" requires the application/wasm MIME type.
    expect(res.headers['content-type']).toBe('application/wasm');
    expect(zlib.brotliDecompressSync(res.body).equals(files[wasm])).toBe(true);
    expectIsolated(res.headers);
  });

  test('when an app route is loaded directly, then the SPA fallback answers the shell', async () => {
    const res = await request(app).get('/practitioner/sessions/123');
    expect(res.status).toBe(200);
    expect(res.text).toContain('Fourpoint shell');
    expect(res.headers['cache-control']).toBe('no-cache');
    expectIsolated(res.headers);
  });

  test('when a missing file with an extension is asked for, then it is 404, not the shell', async () => {
    const res = await request(app).get('/assets/missing.js');
    expect(res.status).toBe(404);
  });

  test('when an unknown /api path is asked for, then it is 404 JSON even with the web export on', async () => {
    const res = await request(app).get('/api/not-a-route');
    expect(res.status).toBe(404);
    expect(res.headers['content-type']).toMatch(/application\/json/);
    expect(res.body.error.code).toBe('not_found');
  });

  test('when no web export is configured, then / is a 404 JSON answer', async () => {
    const res = await request(ctx.app).get('/');
    expect(res.status).toBe(404);
  });
});

describe('caching (RFC 9111 §5.2.2; immutable: RFC 8246)', () => {
  test.each([entryJs, operatorChunk, wasm])(
    'when the content-hashed file %s is asked for, then it may be kept for a year unrevalidated',
    async (file) => {
      const res = await rawGet(`/${file}`, CHROMIUM_ACCEPT_ENCODING);
      expect(res.status).toBe(200);
      expect(res.headers['cache-control']).toBe('public, max-age=31536000, immutable');
    },
  );

  test.each(['/', '/index.html', '/sw.js', '/workers/analysis.js', '/operator/clients'])(
    'when the unhashed %s is asked for, then the browser must revalidate it (no-cache)',
    async (requestPath) => {
      const res = await rawGet(requestPath, CHROMIUM_ACCEPT_ENCODING);
      expect(res.status).toBe(200);
      expect(res.headers['cache-control']).toBe('no-cache');
    },
  );
});

// JavaScript's type is text/javascript (RFC 9239 §6).
describe('compression by content negotiation (RFC 9110 §12.5.3 Accept-Encoding, §12.5.5 Vary)', () => {
  // Decoders: node:zlib's brotli (RFC 7932) and gzip (RFC 1952) implementations, not our code.
  const decode: Record<string, (body: Buffer) => Buffer> = {
    br: (body) => zlib.brotliDecompressSync(body),
    gzip: (body) => zlib.gunzipSync(body),
  };

  test.each([
    ['br', 'br', entryJs, 'text/javascript; charset=utf-8'],
    ['gzip', 'gzip', entryJs, 'text/javascript; charset=utf-8'],
    [CHROMIUM_ACCEPT_ENCODING, 'br', entryJs, 'text/javascript; charset=utf-8'],
    ['br;q=0, gzip', 'gzip', entryJs, 'text/javascript; charset=utf-8'],
    ['*', 'br', entryJs, 'text/javascript; charset=utf-8'],
    ['br', 'br', 'index.html', 'text/html; charset=utf-8'],
    ['gzip', 'gzip', 'workers/analysis.js', 'text/javascript; charset=utf-8'],
  ])(
    'when Accept-Encoding is "%s", then %s is sent for %s with its own type and Vary, and decodes to the original',
    async (acceptEncoding, encoding, file, contentType) => {
      const res = await rawGet(`/${file}`, acceptEncoding);
      expect(res.status).toBe(200);
      expect(res.headers['content-encoding']).toBe(encoding);
      expect(res.headers['vary']).toMatch(/Accept-Encoding/i);
      expect(res.headers['content-type']).toBe(contentType);
      expect(res.body.length).toBeLessThan(files[file].length);
      expect(decode[encoding](res.body).equals(files[file])).toBe(true);
      expectIsolated(res.headers);
    },
  );

  test('when the shell is the SPA fallback, then it is compressed too', async () => {
    const res = await rawGet('/operator/capture/new', 'br');
    expect(res.headers['content-encoding']).toBe('br');
    expect(zlib.brotliDecompressSync(res.body).equals(files['index.html'])).toBe(true);
  });

  test.each([undefined, 'identity', 'deflate', 'br;q=0, gzip;q=0'])(
    'when Accept-Encoding is %s, then the original bytes go out unencoded, still with Vary',
    async (acceptEncoding) => {
      const res = await rawGet(`/${entryJs}`, acceptEncoding);
      expect(res.status).toBe(200);
      expect(res.headers['content-encoding']).toBeUndefined();
      expect(res.headers['vary']).toMatch(/Accept-Encoding/i);
      expect(res.headers['content-type']).toBe('text/javascript; charset=utf-8');
      expect(res.body.equals(files[entryJs])).toBe(true);
    },
  );

  test('when a file is too small to gain from compression, then it has no variants and no Vary', async () => {
    expect(fs.existsSync(path.join(webDist, 'tiny.js.br'))).toBe(false);
    const res = await rawGet('/tiny.js', 'br');
    expect(res.headers['content-encoding']).toBeUndefined();
    expect(res.headers['vary']).toBeUndefined();
    expect(res.body.toString()).toBe('1;');
  });

  test('when an original was rewritten after its variants were made, then the stale variants are not sent', async () => {
    const file = path.join(webDist, 'rewritten.js');
    fs.writeFileSync(file, `var before = "${'old '.repeat(500)}";`);
    const run = spawnSync(process.execPath, ['scripts/compress-web.mjs', webDist], {
      cwd: path.resolve(__dirname, '../..'),
    });
    expect(run.status).toBe(0);
    const later = new Date(Date.now() + 5000);
    fs.writeFileSync(file, 'var after = "new";');
    fs.utimesSync(file, later, later);
    const res = await rawGet('/rewritten.js', 'br');
    expect(res.headers['content-encoding']).toBeUndefined();
    expect(res.body.toString()).toBe('var after = "new";');
  });

  test('when a HEAD request asks for a compressed file, then the headers match a GET and no body comes', async () => {
    const res = await request(app).head(`/${entryJs}`).set('Accept-Encoding', 'br');
    expect(res.status).toBe(200);
    expect(res.headers['content-encoding']).toBe('br');
    expect(Number(res.headers['content-length'])).toBe(fs.statSync(path.join(webDist, `${entryJs}.br`)).size);
  });
});

describe('what the web export never serves (OWASP ASVS 4.0.3 §12.3.1, path traversal)', () => {
  test.each(['/%2e%2e/secret.txt', '/..%2fsecret.txt', '/assets/%2e%2e/%2e%2e/secret.txt'])(
    'when %s tries to leave the export, then the file outside is not sent',
    async (requestPath) => {
      const res = await rawGet(requestPath);
      expect(res.body.toString()).not.toContain('outside the export');
      expect(res.status).toBe(404);
    },
  );

  test('when a dot-file inside the export is asked for, then it is not sent (the shell answers instead)', async () => {
    const res = await rawGet('/.env');
    expect(res.body.toString()).not.toContain('SECRET');
    expect(res.body.toString()).toContain('Fourpoint shell');
  });
});
