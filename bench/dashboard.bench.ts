/**
 * Plan-view frame cost in headless Chromium (SwiftShader software WebGL): 50 tracks × 5,000
 * history points while one scan per frame streams in, for the dashboard's cached, chunked layers
 * and for a naive redraw-everything baseline in the same page and run. Prints medians, p95s and
 * the ratio. Run: npm run bench -- dashboard
 */
import { createServer } from 'node:http';
import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { readFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { dirname, extname, join, normalize, resolve } from 'node:path';
import { build } from 'vite';
import { chromiumAvailable, launchChromium, repoRoot, CHROMIUM_PATH } from '../test/web/fixtures/browser.ts';
import type { ModeResult } from '../web/bench/plan-bench.ts';

const FRAMES = Number(process.env.BENCH_FRAMES ?? 120);

function quantile(xs: number[], q: number): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.floor(q * s.length))];
}

async function main(): Promise<void> {
  if (!chromiumAvailable()) {
    console.log(`dashboard bench skipped: no Chromium at ${CHROMIUM_PATH}`);
    if (process.env.CI === 'true') process.exitCode = 1;
    return;
  }
  const out = mkdtempSync(join(tmpdir(), 'et-bench-'));
  await build({
    configFile: false, root: resolve(repoRoot, 'web'), logLevel: 'warn',
    build: { outDir: out, emptyOutDir: true, rollupOptions: { input: resolve(repoRoot, 'web', 'bench', 'plan-bench.html') }, chunkSizeWarningLimit: 4000 },
  });
  const types: Record<string, string> = { '.html': 'text/html', '.js': 'text/javascript' };
  const server = createServer(async (req, res) => {
    const file = normalize(join(out, new URL(req.url ?? '/', 'http://x').pathname));
    if (!file.startsWith(out)) { res.statusCode = 403; res.end(); return; }
    try { res.setHeader('content-type', types[extname(file)] ?? 'application/octet-stream'); res.end(await readFile(file)); }
    catch { res.statusCode = 404; res.end(); }
  });
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
  const port = (server.address() as { port: number }).port;
  const browser = await launchChromium();
  try {
    const page = await browser.newPage({ viewport: { width: 1000, height: 800 } });
    page.on('pageerror', (e) => console.error('page error:', e.message));
    await page.goto(`http://127.0.0.1:${port}/bench/plan-bench.html?frames=${FRAMES}`);
    await page.waitForFunction(() => window.benchResult !== undefined || window.benchError !== undefined, undefined, { timeout: 600_000, polling: 500 });
    const error = await page.evaluate(() => window.benchError);
    if (error) throw new Error(error);
    const results = (await page.evaluate(() => window.benchResult)) as ModeResult[];
    const shot = join(repoRoot, 'test-artifacts', 'dashboard-bench.png');
    mkdirSync(dirname(shot), { recursive: true });
    await page.screenshot({ path: shot });
    const pool = (mode: string, key: 'renderMs' | 'frameMs') => results.filter((r) => r.mode === mode).flatMap((r) => r[key]);
    console.log(`renderer: ${results[0].renderer}; ${results[0].points} history points held (50 tracks); ${FRAMES} frames per pass, 2 passes per mode`);
    console.log('mode      render step median   p95      frame interval median   p95');
    for (const mode of ['layered', 'naive']) {
      const r = pool(mode, 'renderMs'), f = pool(mode, 'frameMs');
      console.log(`${mode.padEnd(9)} ${quantile(r, 0.5).toFixed(2).padStart(10)} ms ${quantile(r, 0.95).toFixed(2).padStart(8)} ms ${quantile(f, 0.5).toFixed(2).padStart(14)} ms ${quantile(f, 0.95).toFixed(2).padStart(8)} ms`);
    }
    const ratio = quantile(pool('naive', 'renderMs'), 0.5) / quantile(pool('layered', 'renderMs'), 0.5);
    const fratio = quantile(pool('naive', 'frameMs'), 0.5) / quantile(pool('layered', 'frameMs'), 0.5);
    console.log(`picture of the last layered pass: ${shot}`);
    console.log(`ratio naive / layered: render step ${ratio.toFixed(1)}×, frame interval ${fratio.toFixed(1)}×`);
  } finally {
    await browser.close();
    server.close();
    rmSync(out, { recursive: true, force: true });
  }
}

main().catch((e: unknown) => { console.error(e); process.exitCode = 1; });
