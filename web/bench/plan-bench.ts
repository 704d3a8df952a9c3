/**
 * Browser side of bench/dashboard.bench.ts: fills 50 tracks × 5,000 points, then streams one
 * scan per animation frame and times the render step (layer updates + pixi draw + a pixel read
 * back, which waits for the GPU) of
 * the real plan scene and of the naive redraw-everything baseline, in the same page.
 */
import { Application } from 'pixi.js';
import { PlanScene } from '../src/plan/scene.ts';
import { softwareWebGl } from '../src/plan/pixi-start.ts';
import { applyMessage } from '../src/stream/reduce.ts';
import { createState, defaultLimits, type DashboardState } from '../src/stream/state.ts';
import { NaivePlan } from './naive-plan.ts';
import { scanAt } from './synthetic.ts';

const TRACKS = 50;
const POINTS = 5000;
const DT = 0.04;
const params = new URLSearchParams(location.search);
const FRAMES = Number(params.get('frames') ?? 120);
const WARMUP = 15;

export interface ModeResult { mode: string; renderer: string; renderMs: number[]; frameMs: number[]; points: number }
declare global { interface Window { benchResult?: ModeResult[]; benchError?: string } }

function filledState(): { state: DashboardState; t: number } {
  const state = createState();
  let t = 0;
  for (let i = 0; i < POINTS; i++, t += DT) applyMessage(state, scanAt(TRACKS, t, DT), defaultLimits);
  return { state, t };
}

function finish(renderer: unknown): void {
  // Include the GPU's (SwiftShader's) work in the timed step, not only the command submission.
  // gl.finish() does not wait in Chromium; reading one pixel back does.
  const gl = (renderer as { gl?: WebGLRenderingContext }).gl;
  if (gl) gl.readPixels(0, 0, 1, 1, gl.RGBA, gl.UNSIGNED_BYTE, new Uint8Array(4));
}

function countPoints(s: DashboardState): number {
  let n = 0;
  for (const t of s.tracks.values()) n += t.history.length;
  return n;
}

async function measure(mode: 'layered' | 'naive', keep = false): Promise<ModeResult> {
  const host = document.getElementById('plan')!;
  host.replaceChildren();
  let { state, t } = filledState();
  let step: () => void;
  let rendererName = '';
  let cleanup: () => void;
  if (mode === 'layered') {
    const scene = await PlanScene.create(host);
    scene.setSettings({ trailSeconds: Infinity });
    scene.setState(state);
    rendererName = scene.rendererName;
    step = () => { scene.renderNow(); finish(scene.renderer); };
    cleanup = () => scene.destroy();
  } else {
    const app = new Application();
    await app.init({ width: 1000, height: 800, preference: ['webgl', 'canvas'], failIfMajorPerformanceCaveat: false, background: 0x0c1116, antialias: !softwareWebGl(), autoStart: false });
    app.ticker.stop();
    host.appendChild(app.canvas);
    rendererName = app.renderer.name;
    const naive = new NaivePlan(app);
    const view = { centreX: 0, centreY: 1, scale: 50, width: 1000, height: 800 };
    step = () => { naive.render(view, state); finish(app.renderer); };
    cleanup = () => app.destroy(true, { children: true });
  }
  const renderMs: number[] = [], frameMs: number[] = [];
  let last = 0;
  await new Promise<void>((done) => {
    let frame = 0;
    const tick = (now: number) => {
      t += DT;
      applyMessage(state, scanAt(TRACKS, t, DT), defaultLimits);
      const t0 = performance.now();
      step();
      const t1 = performance.now();
      if (frame >= WARMUP) { renderMs.push(t1 - t0); if (last) frameMs.push(now - last); }
      last = now;
      if (++frame < FRAMES + WARMUP) requestAnimationFrame(tick); else done();
    };
    requestAnimationFrame(tick);
  });
  const points = countPoints(state);
  if (!keep) cleanup();
  state = createState();
  return { mode, renderer: rendererName, renderMs, frameMs, points };
}

(async () => {
  try {
    const results: ModeResult[] = [];
    // Same page, same data, one after the other; the order alternates to spread warm-up effects.
    for (const mode of ['layered', 'naive', 'layered', 'naive'] as const) results.push(await measure(mode));
    // A last, untimed layered pass stays on screen so the runner can save what was drawn.
    await measure('layered', true);
    window.benchResult = results;
  } catch (e) {
    window.benchError = e instanceof Error ? `${e.message}\n${e.stack}` : String(e);
  }
})();
