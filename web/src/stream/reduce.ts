/**
 * Folds validated server messages into the dashboard state. Pure apart from mutating `state`,
 * which keeps it testable without a socket or a browser.
 */
import type { ComparisonFigures, ServerMessage, TrackWire } from '../../../bridge/server/protocol.ts';
import type { HistoryRing } from './ring.ts';
import { POSITIONER_PATH_ID } from '../../../bridge/server/protocol.ts';
import { extendPositionerPath } from './positioner-path.ts';
import {
  type DashboardState, type StateLimits, defaultLimits, loadFlatHistory, newTrack, pruneDetections,
} from './state.ts';

/** A scan this far behind the latest time means the replay jumped back without a snapshot. */
const BACKWARD_JUMP_S = 0.5;

export function applyMessage(state: DashboardState, msg: ServerMessage, limits: StateLimits = defaultLimits): void {
  switch (msg.type) {
    case 'hello':
      state.serverName = msg.server;
      return;
    case 'snapshot':
      restart(state, msg.timeS);
      state.source = msg.source;
      state.replay = msg.replay;
      for (const w of msg.tracks) state.tracks.set(w.id, newTrack(w, limits));
      for (const h of msg.history) {
        const entry = state.tracks.get(h.id);
        if (!entry) continue;
        loadFlatHistory(entry.history, h.points, h.kinematics);
        if (entry.history.length > 0 && entry.latest.startS === undefined) entry.firstSeenS = entry.history.timeS[entry.history.slot(entry.history.firstSeq)];
      }
      // Tracks without sent history still get their current point, so a trail can start.
      for (const entry of state.tracks.values()) if (entry.history.length === 0) pushUpdate(entry.history, entry.latest);
      for (const d of msg.detections) addDetection(state, d.timeS, d.azimuthRad, d.rangeM, d.fixed ?? false);
      setFixedEchoes(state, msg.fixedEchoes);
      // Paths built from positioner samples go on growing with the scans' samples; a bridge that
      // does not say where its paths come from sends several only when they were given whole, and
      // a single unnamed one may be a positioner-built one.
      state.commandedExplicit = msg.commandedFrom !== undefined ? msg.commandedFrom === 'whole' : msg.commandedPaths !== undefined;
      setCommandedPaths(state, msg.commandedPaths ?? (msg.commanded.length ? [{ target: '', path: msg.commanded.slice() }] : []));
      loadComparisonHistory(state, msg.comparisonHistory ?? [], limits);
      pruneDetections(state, limits);
      return;
    case 'scan': {
      const t = scanTime(msg);
      if (t < state.timeS - BACKWARD_JUMP_S) restart(state, t);
      state.timeS = Math.max(state.timeS, t);
      for (const d of msg.detections) addDetection(state, d.timeS, d.azimuthRad, d.rangeM, d.fixed ?? false);
      if (state.capture.active) {
        const room = state.capture.limit - state.capture.detections.length;
        if (room > 0) state.capture.detections.push(...msg.detections.slice(0, room));
      }
      for (const w of msg.updates) {
        let entry = state.tracks.get(w.id);
        if (!entry) {
          entry = newTrack(w, limits);
          state.tracks.set(w.id, entry);
        }
        entry.latest = w;
        pushUpdate(entry.history, w);
      }
      for (const del of msg.deletions) state.tracks.delete(del.id);
      if (msg.antennaAzimuthRad !== null) state.antennaAzimuthRad = msg.antennaAzimuthRad;
      for (const p of msg.positioner) state.positioners.set(p.target ?? '', p);
      if (extendPositionerPath(state, msg.positioner)) state.commandedVersion++;
      pruneDetections(state, limits);
      return;
    }
    case 'fixed-echoes':
      setFixedEchoes(state, msg.echoes);
      return;
    case 'source':
      state.source = msg.source;
      return;
    case 'replay':
      state.replay = msg.replay;
      return;
    case 'commanded':
      state.commandedExplicit = true;
      if (msg.target === undefined) setCommandedPaths(state, [{ target: '', path: msg.path }]);
      else setCommandedPaths(state, [...state.commandedPaths.filter((p) => p.target !== msg.target && p.target !== ''), { target: msg.target, path: msg.path }]);
      return;
    case 'comparison':
      state.comparison = msg.figures;
      state.comparisons.set(msg.figures.pathId ?? '', msg.figures);
      if (msg.recent) addRecentPoints(state, msg.figures.pathId ?? '', msg.recent);
      // Figures against a path given whole: positioner samples must not extend it. (A path named
      // after its positioner, built here from its samples, is not one.)
      if (msg.figures.pathId !== undefined && msg.figures.pathId !== POSITIONER_PATH_ID && !builtFromPositioner(state, msg.figures.pathId)) state.commandedExplicit = true;
      // With `recent` the chart has its points; the figures of the moment are one more otherwise.
      if (!msg.recent) state.comparisonHistory.push(msg.figures);
      if (state.comparisonHistory.length > limits.comparisonPoints) state.comparisonHistory.splice(0, state.comparisonHistory.length - limits.comparisonPoints);
      return;
    case 'sessions':
      state.sessions = msg.sessions;
      return;
    case 'error':
      state.lastError = { code: msg.code, message: msg.message };
      return;
  }
}

/** A point of a running-RMSE chart: of the figures only the time and the RMSE are known. */
function rmsePoint(timeS: number, rmseM: number, pathId: string): ComparisonFigures {
  return { timeS, samples: 0, rmseM, crossTrackM: null, alongTrackM: null, maxErrorM: null, lagS: null, trackId: null, pathId };
}

/**
 * The running-RMSE charts from a snapshot's history (the bridge's figures since the run's start).
 */
function loadComparisonHistory(state: DashboardState, history: readonly { pathId: string; points: readonly number[] }[], limits: StateLimits): void {
  const points: ComparisonFigures[] = [];
  for (const h of history) {
    for (let i = 0; i + 1 < h.points.length; i += 2) {
      points.push(rmsePoint(h.points[i], h.points[i + 1], h.pathId));
    }
  }
  points.sort((a, b) => a.timeS - b.timeS);
  state.comparisonHistory = points.slice(-limits.comparisonPoints);
}

/** The running-RMSE points a `comparison` message brings, after those this path's chart holds. */
function addRecentPoints(state: DashboardState, pathId: string, recent: readonly number[]): void {
  let lastS = -Infinity;
  for (let i = state.comparisonHistory.length - 1; i >= 0; i--) {
    const f = state.comparisonHistory[i];
    if ((f.pathId ?? '') === pathId) {
      lastS = f.timeS;
      break;
    }
  }
  for (let i = 0; i + 1 < recent.length; i += 2) {
    if (recent[i] <= lastS) continue;
    state.comparisonHistory.push(rmsePoint(recent[i], recent[i + 1], pathId));
  }
}

/** True when `pathId` names a path this dashboard builds from its positioner's samples. */
function builtFromPositioner(state: DashboardState, pathId: string): boolean {
  return !state.commandedExplicit && state.commandedPaths.some((p) => p.target === pathId);
}

/**
 * The run time a scan stands for. Normally its `timeS`; but a bridge that kept the highest time
 * ever seen across a seek, loop or session switch sends a `timeS` far beyond what the scan holds,
 * and the clock (track ages, chart windows) would stick there. When the scan's own detections and
 * updates are all well before its `timeS`, the newest of them is the time.
 */
export function scanTime(msg: Extract<ServerMessage, { type: 'scan' }>): number {
  let newest = -Infinity;
  for (const d of msg.detections) if (d.timeS > newest) newest = d.timeS;
  for (const u of msg.updates) if (u.timeS > newest) newest = u.timeS;
  for (const p of msg.positioner) if (p.timeS > newest) newest = p.timeS;
  return newest > -Infinity && msg.timeS > newest + BACKWARD_JUMP_S ? newest : msg.timeS;
}

function restart(state: DashboardState, timeS: number): void {
  state.tracks.clear();
  state.detections.length = 0;
  state.comparison = null;
  state.comparisonHistory.length = 0;
  state.comparisons.clear();
  state.positioners.clear();
  state.timeS = timeS;
  state.epoch++;
}

function pushUpdate(ring: HistoryRing, w: TrackWire): void {
  const last = ring.last();
  // Repeated updates at the same time (a coast and a hit in one scan) keep only the newest.
  if (last && w.timeS <= last.timeS) return;
  ring.push({ timeS: w.timeS, x: w.x, y: w.y, speed: w.speed, headingRad: w.headingRad });
}

function addDetection(state: DashboardState, timeS: number, azimuthRad: number, rangeM: number, fixed: boolean): void {
  state.detections.push({ timeS, x: rangeM * Math.sin(azimuthRad), y: rangeM * Math.cos(azimuthRad), fixed });
}

function setFixedEchoes(state: DashboardState, echoes: { x: number; y: number; amplitude: number }[]): void {
  state.fixedEchoes = echoes.map((e) => ({ x: e.x, y: e.y, amplitude: e.amplitude }));
  state.fixedVersion++;
}

function setCommandedPaths(state: DashboardState, paths: DashboardState['commandedPaths']): void {
  if (paths.length === 0 && state.commandedPaths.length === 0) return;
  state.commandedPaths = paths;
  state.commandedVersion++;
}
