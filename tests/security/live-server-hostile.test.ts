// The same kinds of attack against the real process, seeded with the demo fleet as an outside
// tester would find it: hostile files in a concurrent burst, malformed HTTP on raw sockets,
// requests cut off half-way. The process must stay up, answer health, store nothing, and log no
// unexpected error (pino level 50 is "error", level 60 "fatal").
import { mkdtempSync, rmSync } from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { deepJson, hostileFiles } from './support/hostile.ts';
import { login, ROOT, serverCommand, sleep, startRealServer, type RealServer } from './support/real-server.ts';
import { stateCounts } from './support/sqlite.ts';

let dataDir: string;
let server: RealServer;
let installer: string;
let lead: string;
let before: Record<string, number>;
const db = () => path.join(dataDir, 'weir.sqlite');

/** Writes raw bytes to the server and returns what comes back before it closes (or `waitMs`). */
function raw(payload: string | Buffer, { waitMs = 3000, destroyAfterWrite = false } = {}): Promise<string> {
  return new Promise((resolve) => {
    const socket = net.connect(server.port, '127.0.0.1');
    let out = '';
    const done = () => {
      socket.destroy();
      resolve(out);
    };
    const timer = setTimeout(done, waitMs);
    socket.on('data', (d) => { out += d.toString('latin1'); });
    socket.on('error', () => undefined);
    socket.on('close', () => {
      clearTimeout(timer);
      resolve(out);
    });
    socket.write(payload, () => {
      if (destroyAfterWrite) {
        clearTimeout(timer);
        done();
      }
    });
  });
}

const statusOf = (response: string) => Number(/^HTTP\/1\.1 (\d{3})/.exec(response)?.[1] ?? 0);

beforeAll(async () => {
  dataDir = mkdtempSync(path.join(os.tmpdir(), 'weir-live-'));
  const seeded = await serverCommand(['seed'], dataDir, { WEIR_EXAMPLES_DIR: path.join(ROOT, 'examples') });
  expect(seeded.exitCode, seeded.stderr).toBe(0);
  server = await startRealServer(dataDir, { WEIR_LOG_LEVEL: 'info' });
  installer = await login(server.url, 'installer@example.test');
  lead = await login(server.url, 'lead@example.test');
  before = await stateCounts(db());
  expect(before.sites).toBeGreaterThan(10);
}, 90_000);
afterAll(async () => {
  await server?.kill('SIGTERM');
  rmSync(dataDir, { recursive: true, force: true });
});

describe('a seeded server under attack', () => {
  it('When 60 hostile pushes, reviews and sign-ins arrive at once, then every one is a 4xx', async () => {
    // fetch takes text or a plain Uint8Array as a body.
    const files = Object.values(hostileFiles()).map((f) => (typeof f === 'string' ? f : new Uint8Array(f)));
    const requests: Promise<Response>[] = [];
    for (let i = 0; i < 20; i++) {
      requests.push(fetch(`${server.url}/api/revisions`, { method: 'POST', headers: { authorization: `Bearer ${installer}`, 'content-type': 'application/yaml' }, body: files[i % files.length] }));
      requests.push(fetch(`${server.url}/api/revisions/1/review`, { method: 'POST', headers: { authorization: `Bearer ${lead}`, 'content-type': 'application/json' }, body: i % 2 ? deepJson(20_000) : '{"decision":"approve","__proto__":{"x":1}}' }));
      requests.push(fetch(`${server.url}/api/auth/login`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: i % 2 ? '{"email":{"$gt":""},"password":{"$gt":""}}' : `{"email":"${'a'.repeat(300)}@example.test","password":"x"}` }));
    }
    const answers = await Promise.all(requests);
    for (const res of answers) {
      expect(res.status, await res.clone().text()).toBeGreaterThanOrEqual(400);
      expect(res.status).toBeLessThan(500);
      await res.arrayBuffer();
    }
  });

  it('When the HTTP itself is malformed (huge headers, smuggling, bad versions, lies about length), then a 4xx and nothing behind it is answered', async () => {
    const host = `127.0.0.1:${server.port}`;
    const cases: [string, string | Buffer, number[]][] = [
      ['headers over the limit', `GET /api/health HTTP/1.1\r\nHost: ${host}\r\nX-Big: ${'a'.repeat(20_000)}\r\n\r\n`, [431, 400]],
      ['Content-Length and Transfer-Encoding together', `POST /api/auth/login HTTP/1.1\r\nHost: ${host}\r\nContent-Type: application/json\r\nContent-Length: 4\r\nTransfer-Encoding: chunked\r\n\r\n0\r\n\r\nGET /api/users HTTP/1.1\r\nHost: ${host}\r\n\r\n`, [400]],
      ['two Content-Length values', `POST /api/auth/login HTTP/1.1\r\nHost: ${host}\r\nContent-Type: application/json\r\nContent-Length: 2\r\nContent-Length: 40\r\n\r\n{}`, [400]],
      ['a bad chunk size', `POST /api/auth/login HTTP/1.1\r\nHost: ${host}\r\nContent-Type: application/json\r\nTransfer-Encoding: chunked\r\n\r\nzz\r\n{}\r\n0\r\n\r\n`, [400]],
      ['an unknown HTTP version', `GET /api/health HTTP/9.9\r\nHost: ${host}\r\n\r\n`, [400, 505]],
      ['a request line of garbage', '\u0000\u0001\u0002 / \r\n\r\n', [400]],
      ['a path with NUL and CRLF', `GET /api/sites/%00%0d%0aX:1 HTTP/1.1\r\nHost: ${host}\r\nAuthorization: Bearer ${lead}\r\n\r\n`, [404]],
    ];
    for (const [what, payload, statuses] of cases) {
      const response = await raw(payload);
      expect(statuses, `${what}: ${response.slice(0, 200)}`).toContain(statusOf(response));
      expect(response, what).not.toMatch(/"users":|"items":\s*\[\s*\{\s*"id":\s*\d+,\s*"email"/);
    }
  });

  it('When uploads and pushes are cut off half-way, then nothing is stored and the server goes on', async () => {
    const host = `127.0.0.1:${server.port}`;
    const boundary = 'CutOff';
    const head = `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="a.png"\r\nContent-Type: image/png\r\n\r\n`;
    const partialUpload = Buffer.concat([
      Buffer.from(`POST /api/sites/bluestem-cold-store/attachments HTTP/1.1\r\nHost: ${host}\r\nAuthorization: Bearer ${installer}\r\nContent-Type: multipart/form-data; boundary=${boundary}\r\nContent-Length: 5000000\r\n\r\n${head}`),
      Buffer.from('89504e470d0a1a0a', 'hex'),
      Buffer.alloc(64 * 1024, 1),
    ]);
    const partialPush = `POST /api/revisions HTTP/1.1\r\nHost: ${host}\r\nAuthorization: Bearer ${installer}\r\nContent-Type: application/yaml\r\nContent-Length: 100000\r\n\r\nweir: 1\nsite:\n  id: cut-off\n`;
    await Promise.all(Array.from({ length: 10 }, (_, i) => raw(i % 2 ? partialUpload : partialPush, { destroyAfterWrite: true })));
    await sleep(300);
    expect((await fetch(`${server.url}/api/health`)).status).toBe(200);
  });

  it('When it is all over, then the process is up, nothing was stored, the log verifies and no unexpected error was logged', async () => {
    expect(server.alive()).toBe(true);
    expect((await fetch(`${server.url}/api/health`)).status).toBe(200);
    expect(await stateCounts(db())).toEqual(before);
    const verify = await fetch(`${server.url}/api/audit/verify`, { headers: { authorization: `Bearer ${lead}` } });
    expect(((await verify.json()) as { ok: boolean }).ok).toBe(true);
    const logged = server.output().split('\n').filter((l) => /"level":(50|60)/.test(l));
    expect(logged, logged.join('\n').slice(0, 2000)).toEqual([]);
    expect(server.output()).not.toMatch(/\n\s+at .+:\d+:\d+\)?\n/);
  });
});
