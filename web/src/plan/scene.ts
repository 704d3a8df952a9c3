/**
 * The plan view: a pixi.js application with cached layers, rendered on demand (when a stream
 * frame arrives or the view changes) rather than on a free-running ticker, which matters on a
 * shared CPU with software rendering.
 */
import { Application, Container, RenderTexture, Sprite, type Renderer } from 'pixi.js';
import type { DashboardState } from '../stream/state.ts';
import { type Coverage, defaultCoverage } from './coverage.ts';
import { DetectionDots } from './detection-dots.ts';
import { PathLayer } from './path-layer.ts';
import { startPixi } from './pixi-start.ts';
import { background } from './palette.ts';
import { StaticLayer } from './static-layer.ts';
import { TrackMarkers } from './track-markers.ts';
import { TrailLayer } from './trails.ts';
import { type Insets, type View, fitBounds, noInsets, panBy, toScreen, trackFitBounds, zoomAt } from './view.ts';
import type { LabelBox } from './label-placement.ts';

export interface PlanSettings {
  showGrid: boolean;
  showFixedEchoes: boolean;
  showDetections: boolean;
  /** Seconds of trail to show; Infinity for all that is held. */
  trailSeconds: number;
  /** Seconds a detection dot takes to fade out. */
  detectionAgeS: number;
  selectedId: number | null;
  hoverId: number | null;
}

/** The user-facing toggles (selection and hover are set by the plan view itself). */
export type LayerSettings = Omit<PlanSettings, 'selectedId' | 'hoverId'>;

export const defaultSettings: PlanSettings = {
  showGrid: false, showFixedEchoes: true, showDetections: true, trailSeconds: 30, detectionAgeS: 3,
  selectedId: null, hoverId: null,
};

export class PlanScene {
  view: View;
  settings: PlanSettings = { ...defaultSettings };
  coverage: Coverage = defaultCoverage;
  /** 'webgl' or 'canvas': which renderer pixi found. */
  rendererName = '';
  private readonly staticLayer = new StaticLayer();
  private readonly trails = new TrailLayer();
  private readonly world = new Container();
  private readonly markers = new TrackMarkers();
  private readonly paths = new PathLayer();
  private dots!: DetectionDots;
  /**
   * Everything that changes rarely — rings, coverage, grid, fixed echoes and the settled trail
   * chunks — rendered into one texture when one of them changes, so a streaming frame draws a
   * single opaque quad for them. With software rendering every full-screen layer costs.
   */
  private backdrop: RenderTexture | null = null;
  private readonly backdropSprite = new Sprite();
  private readonly backdropContent = new Container();
  private backdropKey = '';
  private state: DashboardState | null = null;
  private pending = false;
  /** Screen boxes of the controls laid over the canvas (toolbar, legend): labels keep clear of them. */
  private covered: LabelBox[] = [];
  /** True while the view is the reset one: overlays or a new size then re-frame it. */
  private atReset = false;

  private constructor(private readonly app: Application, width: number, height: number) {
    this.view = { centreX: 0, centreY: 0, scale: 50, width, height };
  }

  static async create(host: HTMLElement): Promise<PlanScene> {
    const width = Math.max(1, host.clientWidth), height = Math.max(1, host.clientHeight);
    const app = await startPixi(width, height);
    app.ticker.stop();
    host.appendChild(app.canvas);
    const scene = new PlanScene(app, width, height);
    scene.rendererName = app.renderer.name;
    scene.dots = new DetectionDots(app.renderer, scene.rendererName === 'webgl');
    scene.paths.useBlendedBand(scene.rendererName === 'webgl');
    scene.world.addChild(scene.trails.live);
    scene.backdropContent.addChild(scene.staticLayer.container, scene.dots.fixedContainer, scene.trails.settled);
    app.stage.addChild(scene.backdropSprite, scene.world, scene.paths.container,
      scene.dots.container, scene.markers.container);
    scene.reset();
    return scene;
  }

  /** The pixi renderer (the benchmark waits on its GPU work). */
  get renderer(): Renderer {
    return this.app.renderer;
  }

  get canvas(): HTMLCanvasElement {
    return this.app.canvas;
  }

  resize(width: number, height: number): void {
    this.app.renderer.resize(width, height);
    this.view = { ...this.view, width, height };
    if (this.atReset) this.reset();
    this.requestRender();
  }

  setState(state: DashboardState): void {
    this.state = state;
    this.requestRender();
  }

  setSettings(patch: Partial<PlanSettings>): void {
    this.settings = { ...this.settings, ...patch };
    this.requestRender();
  }

  /** The overlays' boxes, canvas pixels; the toolbar along the top also moves the reset view down. */
  setCovered(boxes: LabelBox[]): void {
    if (JSON.stringify(boxes) === JSON.stringify(this.covered)) return;
    this.covered = boxes;
    if (this.atReset) this.reset();
    this.requestRender();
  }

  /** Space kept free at the top for the toolbar when framing the coverage. */
  private insets(): Insets {
    const top = Math.max(0, ...this.covered.filter((b) => b.y < 20 && b.w < this.view.width * 0.9).map((b) => b.y + b.h));
    return { ...noInsets, top };
  }

  zoomAt(px: number, py: number, factor: number): void { this.setView(zoomAt(this.view, px, py, factor)); }
  panBy(dx: number, dy: number): void { this.setView(panBy(this.view, dx, dy)); }

  /** Show the whole coverage with the radar in it. */
  reset(): void {
    const r = this.coverage.maxRangeM;
    this.setView(fitBounds(this.view, { minX: -r, minY: -r, maxX: r, maxY: r }, 28, 0.5, this.insets()));
    this.atReset = true;
  }

  /**
   * Frame the current tracks and their visible trails (every point), at least FIT_MIN_SPAN_M
   * across (view.ts); falls back to reset when there are none.
   */
  fitTracks(): void {
    const s = this.state;
    const pts: { x: number; y: number }[] = [];
    if (s) for (const t of s.tracks.values()) {
      const h = t.history;
      const from = Math.max(h.firstSeq, h.seqAtOrAfter(s.timeS - this.settings.trailSeconds));
      for (let q = from; q < h.pushed; q++) pts.push({ x: h.x[q % h.capacity], y: h.y[q % h.capacity] });
      pts.push({ x: t.latest.x, y: t.latest.y });
    }
    const b = trackFitBounds(pts);
    if (b) this.setView(fitBounds(this.view, b, 40, 0.5, this.insets())); else this.reset();
  }

  pick(px: number, py: number): number | null { return this.markers.pick(px, py); }
  project(x: number, y: number): { px: number; py: number } { return toScreen(this.view, x, y); }

  private setView(v: View): void {
    this.atReset = false;
    this.view = v;
    this.requestRender();
  }

  /** Coalesce every change within a frame into one render. */
  requestRender(): void {
    if (this.pending) return;
    this.pending = true;
    requestAnimationFrame(() => { this.pending = false; this.renderNow(); });
  }

  /** The render step: layer updates plus the pixi draw. */
  renderNow(): void {
    const v = this.view, s = this.state, o = this.settings;
    let backdropChanged = this.staticLayer.update(v, this.coverage, o.showGrid, this.covered);
    this.world.position.set(v.width / 2 - v.centreX * v.scale, v.height / 2 + v.centreY * v.scale);
    this.world.scale.set(v.scale, -v.scale);
    if (s) {
      backdropChanged = this.dots.updateFixed(v, s.fixedEchoes, s.fixedVersion, o.showFixedEchoes) || backdropChanged;
      // Canvas fallback: line width in metres, snapped to zoom steps of ~20 % so a wheel
      // gesture does not re-stroke every trail on every notch.
      if (this.rendererName === 'canvas') this.trails.setWorldWidth(1.2 / 1.2 ** Math.round(Math.log(v.scale) / Math.log(1.2)));
      this.trails.update(s.tracks, s.timeS, o.trailSeconds, s.epoch);
      this.paths.update(v, s, this.coverage.maxRangeM, o.selectedId, s.timeS - o.trailSeconds);
      this.dots.update(v, s.detections, s.timeS, o.detectionAgeS, o.showDetections);
      this.markers.update(v, s.tracks, o.selectedId, o.hoverId);
    }
    this.renderBackdrop(backdropChanged);
    this.app.render();
  }

  private renderBackdrop(changed: boolean): void {
    const v = this.view;
    const res = this.app.renderer.resolution;
    const key = `${v.centreX},${v.centreY},${v.scale},${v.width},${v.height},${res}`;
    if (!changed && !this.trails.settledDirty && key === this.backdropKey) return;
    if (!this.backdrop || this.backdrop.width !== v.width || this.backdrop.height !== v.height) {
      this.backdrop?.destroy(true);
      this.backdrop = RenderTexture.create({ width: v.width, height: v.height, resolution: res });
      this.backdropSprite.texture = this.backdrop;
    }
    const settled = this.trails.settled;
    settled.position.copyFrom(this.world.position);
    settled.scale.copyFrom(this.world.scale);
    this.app.renderer.render({ container: this.backdropContent, target: this.backdrop, clear: true, clearColor: background });
    this.trails.settledDirty = false;
    this.backdropKey = key;
  }

  destroy(): void {
    this.backdrop?.destroy(true);
    this.backdropContent.destroy({ children: true });
    this.app.destroy(true, { children: true });
  }
}
