import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { makeSiblingApp, makeTestContext } from './helpers/test-app';

const ctx = makeTestContext();
afterAll(() => ctx.close());

const webDist = fs.mkdtempSync(path.join(os.tmpdir(), 'fourpoint-web-'));
fs.writeFileSync(path.join(webDist, 'index.html'), '<!doctype html><title>Fourpoint shell</title>');
fs.mkdirSync(path.join(webDist, 'assets'));
fs.writeFileSync(
  path.join(webDist, 'assets', 'wa-sqlite.wasm'),
  Buffer.from([0x00, 0x61, 0x73, 0x6d, 0x01, 0, 0, 0]),
);
const app = makeSiblingApp(ctx, { webDist });

const expectIsolated = (headers: Record<string, string>) => {
  expect(headers['cross-origin-opener-policy']).toBe('same-origin');
  expect(headers['cross-origin-embedder-policy']).toBe('require-corp');
  expect(headers['cross-origin-resource-policy']).toBe('same-origin');
};

describe('serving the web export', () => {
  test('when / is asked for, then the shell comes back cross-origin isolated', async () => {
    const res = await request(app).get('/');
    expect(res.status).toBe(200);
    expect(res.text).toContain('Fourpoint shell');
    expectIsolated(res.headers);
  });

  test('when a .wasm file is asked for, then it is served as application/wasm', async () => {
    const res = await request(app).get('/assets/wa-sqlite.wasm');
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('application/wasm');
    expectIsolated(res.headers);
  });

  test('when an app route is loaded directly, then the SPA fallback answers the shell', async () => {
    const res = await request(app).get('/practitioner/sessions/123');
    expect(res.status).toBe(200);
    expect(res.text).toContain('Fourpoint shell');
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
