import { describe, expect, it } from 'vitest';
import type { ComparisonFigures } from '../../bridge/server/protocol.ts';
import { HistoryRing } from '../../web/src/stream/ring.ts';
import { matchPath, pathLabel } from '../../web/src/stream/path-match.ts';

// Two crossing carriages as in the demo: A from (-1.5, 2.4) to (1.5, 3.6), B mirrored.
const A = [{ timeS: 0, x: -1.5, y: 2.4 }, { timeS: 16, x: 1.5, y: 3.6 }];
const B = [{ timeS: 0, x: 1.5, y: 2.4 }, { timeS: 16, x: -1.5, y: 3.6 }];
const paths = [{ target: '1', path: A }, { target: '2', path: B }];

function onPath(path: typeof A, offset = 0.02): HistoryRing {
  const h = new HistoryRing(50);
  for (let t = 1; t <= 5; t += 0.5) {
    const f = t / 16;
    h.push({ timeS: t, x: path[0].x + (path[1].x - path[0].x) * f + offset, y: path[0].y + (path[1].y - path[0].y) * f, speed: 0.2, headingRad: 0 });
  }
  return h;
}
const fig = (trackId: number, pathId: string): ComparisonFigures => ({
  timeS: 5, samples: 10, rmseM: 0.02, crossTrackM: 0, alongTrackM: 0, maxErrorM: 0.05, lagS: 0, trackId, pathId,
});

describe('matchPath', () => {
  it('measures a track on the second carriage against the second path, not the first', () => {
    const m = matchPath({ commandedPaths: paths, comparisons: new Map([['1', fig(3, '1')]]) }, 4, onPath(B));
    expect(m).toMatchObject({ target: '2', how: 'nearest' });
  });

  it('takes the path the bridge follows the track on', () => {
    const m = matchPath({ commandedPaths: paths, comparisons: new Map([['2', fig(7, '2')]]) }, 7, onPath(A, 0.3));
    expect(m).toMatchObject({ target: '2', how: 'followed' });
  });

  it('gives a reason instead of a path when the track follows none', () => {
    const h = new HistoryRing(10);
    for (let t = 1; t <= 3; t++) h.push({ timeS: t, x: 5, y: 6, speed: 0, headingRad: 0 });
    const m = matchPath({ commandedPaths: paths, comparisons: new Map() }, 1, h);
    expect(m.target).toBeNull();
    expect(m.reason).toMatch(/not within 1 m/);
    expect(matchPath({ commandedPaths: [], comparisons: new Map() }, 1, h).reason).toBe('no commanded path');
  });

  it('names paths plainly', () => {
    expect(pathLabel('', 1)).toBe('commanded path');
    expect(pathLabel('2', 2)).toBe('path 2');
    expect(pathLabel('positioner', 2)).toBe('positioner path');
  });
});
