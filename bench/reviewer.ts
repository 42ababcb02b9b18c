// The reviewer: the production bundle's JS size (gzip) for the initial route, with a budget of
// 180 KB; and, in headless Chromium against the server with the fleet's 10,000-site database,
// the time from navigation to a sites table with rows the user can act on (reported).
import { existsSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';
import { chromium, type Browser } from 'playwright-core';
import { serverBuilt, serverEnv } from './api.ts';
import type { BaseSite } from './generate-sites.ts';
import { BENCH_PASSWORD, BENCH_USERS, copyFleet, ensureFleet } from './lib/fleet.ts';
import { freePort, outDir, repoRoot, startServer, type RunningServer } from './lib/processes.ts';
import { atMost, skipped, type Figure } from './lib/report.ts';
import { fmt, median } from './lib/stats.ts';

const BENCH = 'reviewer';
const INITIAL_JS_KB = 180;
const webDir = join(repoRoot, 'dist/web');
export const CHROMIUM = process.env.WEIR_CHROMIUM || '/usr/bin/chromium';
const CHROMIUM_ARGS = ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'];

/** gzip at zlib's default level, as a server compressing on the fly would send it. */
const gzipBytes = (file: string) => gzipSync(readFileSync(file)).length;

function staticEntry(): { entry: string[]; css: string[] } {
  const html = readFileSync(join(webDir, 'index.html'), 'utf8');
  const attr = (re: RegExp) => [...html.matchAll(re)].map((m) => m[1]);
  return {
    entry: [...attr(/<script[^>]*type="module"[^>]*src="([^"]+)"/g), ...attr(/<link[^>]*rel="modulepreload"[^>]*href="([^"]+)"/g)],
    css: attr(/<link[^>]*rel="stylesheet"[^>]*href="([^"]+)"/g),
  };
}

const localFile = (urlPath: string) => join(webDir, decodeURIComponent(urlPath.replace(/^\//, '')));

export async function benchReviewer({ quick, seed, bases }: { quick: boolean; seed: number; bases: BaseSite[] }): Promise<{ figures: Figure[]; notes: string[] }> {
  const budget = `≤ ${INITIAL_JS_KB} KB`;
  if (!existsSync(join(webDir, 'index.html'))) {
    return { figures: [skipped(BENCH, 'initial route JS, gzip', 'the reviewer is not built (npm run build:web)', budget)], notes: [] };
  }
  const figures: Figure[] = [];
  const notes: string[] = [];
  const { entry, css } = staticEntry();
  const jsFiles = readdirSync(join(webDir, 'assets')).filter((f) => f.endsWith('.js'));
  const staticJs = entry.reduce((a, f) => a + gzipBytes(localFile(f)), 0);
  const allJs = jsFiles.reduce((a, f) => a + gzipBytes(join(webDir, 'assets', f)), 0);
  const cssBytes = css.reduce((a, f) => a + gzipBytes(localFile(f)), 0);

  const sites = quick ? 2000 : 10_000;
  let loaded: { ms: number[]; js: Map<string, number>; screenshot: string } | null = null;
  let why = '';
  if (!existsSync(CHROMIUM)) why = `no Chromium at ${CHROMIUM} (apt-get install -y chromium)`;
  else if (!serverBuilt()) why = 'the server is not built (npm run build:server)';
  else loaded = await timeSitesTable({ sites, seed, bases, runs: quick ? 2 : 5, notes });

  if (loaded) {
    const initial = [...loaded.js.values()].reduce((a, b) => a + b, 0);
    figures.push({ bench: BENCH, figure: 'initial route JS, gzip (what /sites loads)', value: fmt.kb(initial), budget, result: atMost(initial / 1024, INITIAL_JS_KB), note: `${loaded.js.size} files: ${[...loaded.js].map(([f, b]) => `${f.replace(/^\/assets\//, '')} ${fmt.kb(b)}`).join(', ')}` });
  } else {
    figures.push({ bench: BENCH, figure: 'initial route JS, gzip (index.html entry + preloads)', value: fmt.kb(staticJs), budget, result: atMost(staticJs / 1024, INITIAL_JS_KB), note: `lazy route chunks not counted: ${why}` });
  }
  figures.push(
    { bench: BENCH, figure: '  entry + modulepreload JS, gzip', value: fmt.kb(staticJs), result: 'INFO' },
    { bench: BENCH, figure: '  all JS in dist/web, gzip', value: fmt.kb(allJs), result: 'INFO', note: `${jsFiles.length} files; CSS ${fmt.kb(cssBytes)} gzip` },
  );
  if (loaded) {
    figures.push({ bench: BENCH, figure: `time to interactive sites table (${fmt.int(sites)} sites)`, value: fmt.ms(median(loaded.ms)), result: 'INFO', note: `median of ${loaded.ms.length} cold loads of /sites (fresh browser context each): navigation start to rows on screen with the main thread free; runs ${loaded.ms.map((m) => m.toFixed(0)).join(', ')} ms; screenshot ${loaded.screenshot.replace(repoRoot, '')}` });
  } else {
    figures.push(skipped(BENCH, 'time to interactive sites table', why));
  }
  return { figures, notes };
}

async function timeSitesTable({ sites, seed, bases, runs, notes }: { sites: number; seed: number; bases: BaseSite[]; runs: number; notes: string[] }) {
  const fleet = await ensureFleet({ sites, revisions: sites * 10, seed, bases, log: (s) => notes.push(s) });
  const dataDir = join(outDir, 'reviewer/data');
  copyFleet(fleet, dataDir);
  let server: RunningServer | null = null;
  let browser: Browser | null = null;
  try {
    server = await startServer([join(repoRoot, 'dist/server.js')], { ...serverEnv(dataDir, await freePort()), WEIR_WEB_DIR: webDir });
    const probe = await fetch(`${server.url}/sites`);
    if (!probe.ok || !(await probe.text()).includes('<div')) throw new Error(`the server does not serve the reviewer at /sites (${probe.status}); it serves dist/web when that exists`);
    // playwright-core gives the browser a fresh temporary --user-data-dir of its own (it refuses
    // one in args), and every context below starts with an empty cache.
    browser = await chromium.launch({ executablePath: CHROMIUM, args: CHROMIUM_ARGS });

    // Sign in once as a user would, and keep the session for the timed loads.
    const signInContext = await browser.newContext();
    const signInPage = await signInContext.newPage();
    await signInPage.goto(`${server.url}/sign-in`);
    await signInPage.getByLabel('E-mail').fill(BENCH_USERS[3].email);
    await signInPage.getByLabel('Password').fill(BENCH_PASSWORD);
    await signInPage.getByRole('button', { name: 'Sign in' }).click();
    await signInPage.locator('table tbody tr a').first().waitFor({ timeout: 30_000 });
    const storageState = await signInContext.storageState();
    await signInContext.close();

    const ms: number[] = [];
    let js = new Map<string, number>();
    const screenshot = join(outDir, 'reviewer-sites.png');
    for (let i = 0; i < runs + 1; i++) {
      const context = await browser.newContext({ storageState, viewport: { width: 1280, height: 900 } });
      const page = await context.newPage();
      const scripts = new Map<string, number>();
      page.on('response', (res) => {
        const url = new URL(res.url());
        if (url.origin === server!.url && url.pathname.endsWith('.js') && existsSync(localFile(url.pathname))) scripts.set(url.pathname, gzipBytes(localFile(url.pathname)));
      });
      await page.goto(`${server.url}/sites`, { waitUntil: 'commit' });
      // Polled on animation frames: true only once rows are on screen and the main thread is free.
      const handle = await page.waitForFunction(() => (document.querySelector('table tbody tr a') ? performance.now() : 0), undefined, { polling: 'raf', timeout: 60_000 });
      const at = (await handle.jsonValue()) as number;
      if (i > 0) ms.push(at); // the first load warms the server's caches, as a second visitor would find it
      js = scripts;
      if (i === runs) await page.screenshot({ path: screenshot, fullPage: false });
      await context.close();
    }
    return { ms, js, screenshot };
  } finally {
    await browser?.close();
    await server?.stop();
    rmSync(dataDir, { recursive: true, force: true }); // a working copy of most of a gigabyte
  }
}
