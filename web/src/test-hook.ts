/**
 * A small read-only handle on `window` for the end-to-end test and the benchmark: they need to
 * know where a world point lands on the canvas to check its pixels. Nothing in the app reads it.
 */
import type { PlanScene } from './plan/scene.ts';
import type { DashboardState } from './stream/state.ts';

export interface EchotrailTestHook {
  renderer: string;
  /** Canvas position (CSS px, relative to the canvas) of a world point in metres. */
  project(x: number, y: number): { px: number; py: number };
  canvasRect(): { left: number; top: number; width: number; height: number };
  trackIds(): number[];
  trackPosition(id: number): { x: number; y: number } | null;
  selectedId(): number | null;
  timeS(): number;
}

declare global {
  interface Window { echotrail?: EchotrailTestHook }
}

export function exposeForTests(scene: PlanScene, data: DashboardState, selected: () => number | null): void {
  window.echotrail = {
    renderer: scene.rendererName,
    project: (x, y) => scene.project(x, y),
    canvasRect: () => {
      const r = scene.canvas.getBoundingClientRect();
      return { left: r.left, top: r.top, width: r.width, height: r.height };
    },
    trackIds: () => [...data.tracks.keys()],
    trackPosition: (id) => {
      const t = data.tracks.get(id);
      return t ? { x: t.latest.x, y: t.latest.y } : null;
    },
    selectedId: selected,
    timeS: () => data.timeS,
  };
}
