// The built reviewer served by the API process: files as they are, index.html for page addresses.
import { mkdir, writeFile } from 'node:fs/promises';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startWeir, type TestWeir } from './helpers.ts';

let weir: TestWeir;

beforeAll(async () => {
  weir = await startWeir();
  // A stand-in for dist/web: the real one is built by vite, which this test does not need.
  const webDir = path.join(weir.dataDir, 'web');
  await mkdir(path.join(webDir, 'assets'), { recursive: true });
  await writeFile(path.join(webDir, 'index.html'), '<!doctype html><title>Weir</title><div id="root"></div>');
  await writeFile(path.join(webDir, 'assets', 'main-abc123.js'), 'console.log("weir")');
  weir.app = (await import('../../server/app.ts')).createApp({ ...weir.runtime, config: { ...weir.config, webDir } });
});
afterAll(() => weir.close());

describe('serving the reviewer', () => {
  it('When a page address is asked for, then index.html, not cached', async () => {
    for (const page of ['/', '/sites', '/sites/mill-lane-bakery', '/revisions/12', '/change-log']) {
      const res = await request(weir.app).get(page).expect(200);
      expect(res.headers['content-type']).toMatch(/^text\/html/);
      expect(res.text).toContain('<div id="root">');
      expect(res.headers['cache-control']).toBe('no-cache');
    }
  });

  it('When a built asset is asked for, then the file, cached for good (its name carries its hash)', async () => {
    const res = await request(weir.app).get('/assets/main-abc123.js').expect(200);
    expect(res.headers['content-type']).toMatch(/javascript/);
    expect(res.headers['cache-control']).toBe('public, max-age=31536000, immutable');
    // helmet's policy: scripts from this origin only.
    expect(res.headers['content-security-policy']).toContain("script-src 'self'");
  });

  it('When an unknown /api address is asked for, then the JSON 404, never index.html', async () => {
    const res = await request(weir.app).get('/api/sites/x/nothing').expect(404);
    expect(res.body.error.code).toBe('not-found');
    await request(weir.app).post('/sites').expect(404);
  });
});
