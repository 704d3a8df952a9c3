import { afterAll, describe, expect, it } from 'vitest';
import { appendFileSync, closeSync, mkdtempSync, openSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { openSession, resolveOpenSessionOptions, sessionIdOf } from '../../bridge/session/reader.ts';
import { Recorder } from '../../bridge/session/recorder.ts';
import { hasCode } from '../../bridge/errors.ts';
import { LineReader } from '../../bridge/session/line-reader.ts';
import type { SourceRecord } from '../../bridge/ingest/source.ts';

const root = mkdtempSync(join(tmpdir(), 'echotrail-reader-'));
afterAll(() => rmSync(root, { recursive: true, force: true }));

const update = (t: number, id: number) => ({
  timeS: t, id, status: 'confirmed' as const, x: t, y: 2, vx: 1, vy: 0, speed: 1, headingRad: Math.PI / 2,
  pxx: 0.01, pxy: 0, pyy: 0.01, quality: 0.9, moving: true, hits: 5, misses: 0,
  measurement: { timeS: t, x: t, y: 2, rxx: 0.01, rxy: 0, ryy: 0.01 }, nis: 1.5,
});

function record(name: string, records: SourceRecord[], close = true): string {
  const r = new Recorder({ dir: root, name, startUtc: new Date('2026-12-02T03:00:00Z') });
  if (!r.open()) throw new Error(r.status().error!);
  for (const x of records) r.record(x);
  if (close) r.closeSync();
  return r.status().path!;
}

const sample: SourceRecord[] = [
  { kind: 'commanded', path: [{ timeS: 0, x: 0, y: 1 }] },
  { kind: 'detection', detection: { timeS: 0.1, azimuthRad: 0.2, rangeM: 3, amplitude: 9, phaseRad: 0.5, line: 4 } },
  { kind: 'antenna', sample: { timeS: 0.1, azimuthRad: 0.2 } },
  { kind: 'positioner', sample: { timeS: 0.1, cmdX: 0, cmdY: 1, measX: 0.01, measY: 0.99 } },
  { kind: 'track', update: update(0.2, 1) },
  { kind: 'fixed-echoes', echoes: [{ x: 1, y: 1, rangeM: 1.41, azimuthRad: 0.78, seen: 3, amplitude: 20 }] },
  { kind: 'deletion', deletion: { timeS: 0.3, id: 1, reason: 'misses' } },
];

describe('openSession', () => {
  it('reads back exactly what was recorded, every kind', async () => {
    const s = await openSession(record('all-kinds', sample));
    expect([...s.records(0)].map((r) => r.record)).toEqual(sample);
    expect(s.endSummary).toEqual({ detections: 1, tracks: 1, lines: 9, hasCommanded: true });
    expect(s.header.name).toBe('all-kinds');
    expect(s.id).toBe('20261202-030000-all-kinds');
    expect(s.durationS).toBeCloseTo(0.3, 12);
    s.close();
  });

  it('reports bad lines with their numbers and keeps the good lines around them', async () => {
    const path = record('with-bad', sample);
    const lines = readFileSync(path, 'utf8').split('\n');
    // Line 3 (the detection) → broken JSON, line 5 (positioner) → a NaN smuggled as null, line 6 → unknown kind.
    lines[2] = lines[2].slice(0, 20);
    lines[4] = lines[4].replace('"cmdX":0', '"cmdX":null');
    lines[5] = '{"k":"warp","timeS":1}';
    writeFileSync(path, lines.join('\n'));
    const s = await openSession(path);
    expect(s.badLines.map((b) => b.line)).toEqual([3, 5, 6]);
    expect(s.badLines[0].reason).toMatch(/not valid JSON/);
    expect(s.badLines[1].reason).toMatch(/cmdX/);
    expect(s.badLineCount).toBe(3);
    const kinds = [...s.records(0)].map((r) => r.record.kind);
    expect(kinds).toEqual(['commanded', 'antenna', 'fixed-echoes', 'deletion']);
    s.close();
  });

  it('counts detections out of bounds (negative range, zero amplitude) as bad lines, never fatal', async () => {
    const det = (t: number, rangeM: number, amplitude: number): SourceRecord => ({ kind: 'detection', detection: { timeS: t, azimuthRad: 0.2, rangeM, amplitude } });
    const path = record('det-bounds', [det(0.1, 3, 9), det(0.2, -1, 9), det(0.3, 3, 0), det(0.4, 0, 1)]);
    const s = await openSession(path);
    expect(s.badLines.map((b) => b.line)).toEqual([3, 4]);
    expect(s.badLines[0].reason).toMatch(/range/);
    expect(s.badLines[1].reason).toMatch(/amplitude/);
    expect(s.detections).toBe(2);
    s.close();
  });

  it('ignores and reports a truncated last line (writer killed mid-line)', async () => {
    const path = record('cut', sample, false);
    appendFileSync(path, '{"k":"det","timeS":0.4,"azim');
    const s = await openSession(path);
    expect(s.truncatedTail).toEqual({ line: 9, bytes: '{"k":"det","timeS":0.4,"azim'.length });
    expect(s.badLineCount).toBe(0);
    expect(s.endSummary).toBeNull();
    expect([...s.records(0)].length).toBe(sample.length);
    s.close();
  });

  it('refuses files that are not sessions with E_SESSION_FORMAT', async () => {
    const notJson = join(root, 'x.session.jsonl');
    writeFileSync(notJson, 'time_s,azimuth_deg\n1,2\n');
    await expect(openSession(notJson)).rejects.toSatisfy((e) => hasCode(e, 'E_SESSION_FORMAT') && /line 1/.test((e as Error).message));
    const empty = join(root, 'empty.session.jsonl');
    writeFileSync(empty, '');
    await expect(openSession(empty)).rejects.toSatisfy((e) => hasCode(e, 'E_SESSION_FORMAT'));
    const newer = record('newer', []);
    const text = readFileSync(newer, 'utf8').replace('"version":1', '"version":7');
    writeFileSync(newer, text);
    await expect(openSession(newer)).rejects.toThrow(/version 7 is newer/);
    // A missing file is a path problem, said as the other commands say it.
    await expect(openSession(join(root, 'missing.session.jsonl'))).rejects.toSatisfy((e) => hasCode(e, 'E_PATH') && /missing\.session\.jsonl: no such file$/.test((e as Error).message));
  });

  it('reports an oversized line as bad without holding it', async () => {
    const path = record('huge', sample.slice(0, 2), false);
    appendFileSync(path, `{"k":"note","timeS":0.2,"text":"${'a'.repeat(5000)}"}\n`);
    appendFileSync(path, JSON.stringify({ k: 'ant', timeS: 0.3, azimuthRad: 1 }) + '\n');
    const s = await openSession(path, { maxLineBytes: 2000 });
    expect(s.badLines.map((b) => [b.line, b.text])).toEqual([[4, '']]);
    expect(s.badLines[0].reason).toMatch(/too long/);
    expect([...s.records(0)].map((r) => r.record.kind)).toEqual(['commanded', 'detection', 'antenna']);
    s.close();
    // A small read chunk makes lines straddle chunk boundaries.
    const fd = openSync(path, 'r');
    const raws = [...new LineReader(fd, { maxLineBytes: 1000, chunkBytes: 700 }).lines(0, 1)];
    closeSync(fd);
    expect(raws.map((r) => r.oversized !== undefined)).toEqual([true, false, false, true, false]);
    expect(JSON.parse(raws[4].text)).toMatchObject({ k: 'ant' });
    expect(raws[4].offset).toBe(readFileSync(path).lastIndexOf('\n', readFileSync(path).length - 2) + 1);
  });

  it('validates its options and derives ids from file names', () => {
    expect(() => resolveOpenSessionOptions({ checkpointS: 0 })).toThrow(/positive/);
    expect(sessionIdOf('/a/b/20261202-030000-x.session.jsonl')).toBe('20261202-030000-x');
  });
});
