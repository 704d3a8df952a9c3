/**
 * The dashboard end to end: the built page in headless Chromium against a real bridge
 * (`startBridge`) replaying the recorded turntable demo session from replays/.
 *
 * Without Chromium the test skips with a message, except under CI=true, where it fails.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { background, trackColour } from '../../web/src/plan/palette.ts';
import {
  colourDistance, repoRoot, rgbOf, samplePixels,
} from '../web/fixtures/browser.ts';
import type { RunningBridge } from '../../bridge/server/bridge.ts';
import { openSession } from '../../bridge/session/reader.ts';
import { formatClock } from '../../web/src/stream/format.ts';
import { dashboardSuiteRuns, openDashboard, type DashboardPage } from '../web/fixtures/dashboard-page.ts';

const artifacts = join(repoRoot, 'test-artifacts');
const session = join(repoRoot, 'replays', 'bay3-turntable-loop.session.jsonl');

describe.skipIf(!dashboardSuiteRuns('dashboard e2e'))('dashboard against a replaying bridge', () => {
  let dashboard: DashboardPage;
  let bridge: RunningBridge;
  let browser: Browser;
  let page: Page;
  let pageErrors: string[] = [];

  beforeAll(async () => {
    dashboard = await openDashboard(session, { width: 1400, height: 860 });
    ({ bridge, browser, page, pageErrors } = dashboard);
  });

  afterAll(async () => {
    await dashboard?.close();
  });

  const clock = () => page.locator('[data-testid=replay-clock]').innerText();
  const sourceState = () => page.locator('[data-testid=source-status] [data-state]').getAttribute('data-state');

  it('loads, reports the replay and lists tracks', async () => {
    await page.waitForFunction(() => window.echotrail !== undefined);
    expect(['webgl', 'canvas']).toContain(await page.evaluate(() => window.echotrail?.renderer));
    await page.locator('[data-testid=source-status] [data-state="replay-playing"]').waitFor();
    await page.locator('[data-testid=track-list] tbody tr[data-track-id]').first().waitFor({ timeout: 60_000 });
    const ids = await page.locator('[data-testid=track-list] tbody tr[data-track-id]').evaluateAll((rows) => rows.map((r) => Number(r.getAttribute('data-track-id'))));
    expect(ids.length).toBeGreaterThan(0);
    expect(await page.locator('[data-testid=track-list]').innerText()).toMatch(/\d+\.\d\d m/);
    expect(pageErrors).toEqual([]);
  });

  it('pauses and the picture stops; plays and it moves on', async () => {
    await page.click('[data-testid=play-pause]');
    await page.locator('[data-testid=source-status] [data-state="replay-paused"]').waitFor();
    await page.locator('[data-testid=play-pause]', { hasText: 'Play' }).waitFor();
    const paused = await clock();
    const pausedT = await page.evaluate(() => window.echotrail!.timeS());
    await page.waitForTimeout(1200);
    expect(await clock()).toBe(paused);
    expect(await page.evaluate(() => window.echotrail!.timeS())).toBe(pausedT);
    await page.click('[data-testid=play-pause]');
    await page.waitForFunction((before) => document.querySelector('[data-testid=replay-clock]')?.textContent?.trim() !== before, paused.trim());
    expect(await sourceState()).toBe('replay-playing');
  });

  it('changes the replay speed through the bridge', async () => {
    await page.selectOption('[data-testid=speed]', '5');
    await page.waitForFunction(() => (document.querySelector('[data-testid=speed]') as HTMLSelectElement).value === '5');
    expect(await page.locator('[data-testid=speed] option:checked').innerText()).toBe('5×');
    await page.selectOption('[data-testid=speed]', '1');
    await page.waitForFunction(() => (document.querySelector('[data-testid=speed]') as HTMLSelectElement).value === '1');
  });

  it('seeks with the timeline and the shown time follows', async () => {
    await page.click('[data-testid=play-pause]');
    await page.locator('[data-testid=source-status] [data-state="replay-paused"]').waitFor();
    await page.locator('[data-testid=timeline]').fill('40');
    await page.waitForFunction(() => document.querySelector('[data-testid=replay-clock]')?.textContent?.startsWith('0:40'));
    await page.waitForFunction(() => Math.abs(window.echotrail!.timeS() - 40) < 1.5);
    await page.locator('[data-testid=timeline]').fill('25');
    await page.waitForFunction(() => document.querySelector('[data-testid=replay-clock]')?.textContent?.startsWith('0:25'));
    await page.waitForFunction(() => Math.abs(window.echotrail!.timeS() - 25) < 1.5);
    // Play on a little so tracks are re-established after the jump, then freeze for the pixel check.
    await page.click('[data-testid=play-pause]');
    await page.waitForFunction(() => window.echotrail!.timeS() > 29, undefined, { timeout: 30_000 });
    await page.click('[data-testid=play-pause]');
    await page.locator('[data-testid=source-status] [data-state="replay-paused"]').waitFor();
  });

  it('draws each track where it is: pixels of its colour at its projected position', async () => {
    const target = await checkTrackPixels(page, 'dashboard-e2e.png');

    // Clicking the symbol selects the track in the shared selection.
    await page.mouse.click(target!.x, target!.y);
    await page.locator('[data-testid=selected-track]', { hasText: `T${target!.id}` }).waitFor();
    await page.locator(`[data-testid=track-list] tr.selected[data-track-id="${target!.id}"]`).waitFor();
    await page.mouse.move(target!.x + 1, target!.y + 1);
    await page.locator('[data-testid=hover-tip]', { hasText: `Track T${target!.id}` }).waitFor();
    await page.screenshot({ path: join(artifacts, 'dashboard-e2e-selected.png') });
  });

  it('shows the commanded-path comparison the session carries', async () => {
    // The panel stands (with a word) before the first figures; wait for the figures themselves.
    const panel = page.locator('[data-testid=comparison]', { hasText: 'RMSE (running)' });
    await panel.waitFor();
    expect(await panel.innerText()).toMatch(/RMSE \(running\)\s+\d+\.\d{3} m/);
    // Negative lags carry the minus sign, as every other signed figure does.
    expect(await panel.innerText()).toMatch(/Lag behind command \(live, − ahead\)\s+(—|−?\d+0 ms|0 ms|−?\d+\.\d+ s)/);
  });

  it('keeps the comparison after a seek while paused', async () => {
    // The replay is still paused from the seek test above.
    await page.mouse.move(5, 5);
    await page.locator('[data-testid=source-status] [data-state=replay-paused]').waitFor();
    const before = await page.locator('[data-testid=replay-clock]').innerText();
    await page.keyboard.press('ArrowLeft');
    await page.waitForFunction((b) => document.querySelector('[data-testid=replay-clock]')?.textContent !== b, before);
    // The bridge compares the re-sent tracks on the kept path at once; the panel never goes away.
    await page.locator('[data-testid=comparison]', { hasText: 'RMSE (running)' }).waitFor({ timeout: 10_000 });
    expect(await page.locator('[data-testid=source-status]').innerText()).toContain('n/a (replay)');
    expect(await page.locator('[data-testid=source-status] [data-state=replay-paused]').count()).toBe(1);
  });

  it('steps back exactly one revolution with ◂ Step and with the , key, paused; not before 0', async () => {
    const reader = await openSession(session);
    const rev = reader.revolutionS!;
    reader.close();
    expect(rev).toBeGreaterThan(0.2);
    // The bridge's own replay position (exact; the clock shows tenths).
    const position = () => bridge.pipeline.replayState()!.positionS;
    const clockShows = (s: number) => page.waitForFunction(
      (want) => document.querySelector('[data-testid=replay-clock]')?.textContent?.startsWith(want), formatClock(s));
    const paused = async () => {
      await page.locator('[data-testid=source-status] [data-state=replay-paused]').waitFor();
      await page.locator('[data-testid=play-pause]', { hasText: 'Play' }).waitFor();
      expect(bridge.pipeline.replayState()!.playing).toBe(false);
    };
    await page.mouse.move(5, 5);
    await paused();
    const start = position();
    const once = start + rev;
    const twice = once + rev;
    await page.click('[data-testid=step-forward]');
    await clockShows(once);
    await page.click('[data-testid=step-forward]');
    await clockShows(twice);
    expect(position()).toBe(twice);
    await page.click('[data-testid=step-back]');
    await clockShows(twice - rev);
    expect(position()).toBe(twice - rev);
    expect(position()).toBeCloseTo(once, 9);
    await paused();
    // A seek underneath: the comparison is rebuilt for the new time and stays on screen.
    await page.locator('[data-testid=comparison]', { hasText: 'RMSE (running)' }).waitFor({ timeout: 10_000 });
    await page.evaluate(() => (document.activeElement as HTMLElement | null)?.blur());
    await page.keyboard.press(',');
    await clockShows(twice - rev - rev);
    expect(position()).toBe(twice - rev - rev);
    await paused();

    // At 0 it stays at 0: a step forward after it lands exactly one revolution in.
    await page.locator('[data-testid=timeline]').fill('0');
    await clockShows(0);
    await page.locator('[data-testid=timeline]').blur();
    await page.keyboard.press(',');
    await page.click('[data-testid=step-forward]');
    await clockShows(rev);
    expect(position()).toBe(rev);
    await paused();
    // Back to where the test found the replay, for the tests after it.
    await page.locator('[data-testid=timeline]').fill(start.toFixed(1));
    await clockShows(Number(start.toFixed(1)));
    await page.locator('[data-testid=timeline]').blur();
    expect(pageErrors).toEqual([]);
  });

  it('opens the safety note and the shortcut list from the keyboard', async () => {
    await page.mouse.move(5, 5);
    await page.keyboard.press('s');
    await page.locator('[data-testid=safety]', { hasText: 'IEEE C95.1-2019' }).waitFor();
    await page.keyboard.press('Escape');
    await page.keyboard.press('?');
    await page.locator('[data-testid=help]', { hasText: 'Play / pause the replay' }).waitFor();
    expect(await page.locator('[data-testid=help]').innerText()).toMatch(/,\s+Step back and pause/);
    await page.keyboard.press('Escape');
    expect(await page.locator('[role=dialog]').count()).toBe(0);
    expect(pageErrors).toEqual([]);
  });

  it('runs the guided calibration against the bridge: guide, capture, fit', async () => {
    // From near the start of the 60 s session (paused), so the capture below ends before it loops.
    await page.locator('[data-testid=source-status] [data-state="replay-paused"]').waitFor();
    await page.locator('[data-testid=timeline]').fill('2');
    await page.waitForFunction(() => document.querySelector('[data-testid=replay-clock]')?.textContent?.startsWith('0:02'));
    await page.click('[data-testid=open-calibration]');
    const dialog = page.locator('[data-testid=calibration]');
    await dialog.locator('.steps li').first().waitFor();
    await dialog.getByRole('button', { name: '● Start capture' }).click();
    // Keys inside the dialog belong to it; with focus outside, Space resumes the replay.
    await page.evaluate(() => (document.activeElement as HTMLElement | null)?.blur());
    await page.keyboard.press(' ');
    await page.locator('[data-testid=source-status] [data-state="replay-playing"]').waitFor();
    // Enough revolutions (about 30 of the 0.5 s antenna) for the rail mounts to pass the guide's 20
    // per spot (fitted below).
    await page.waitForFunction(() => /([4-9]\d{2}|\d{4,}) detections/.test(document.querySelector('[data-testid=calibration]')?.textContent ?? ''), undefined, { timeout: 60_000 });
    await dialog.getByRole('button', { name: '■ Stop capture' }).click();

    // The spot row starts empty (placeholders only): fitting it is refused in the panel, naming the
    // spot, and nothing is offered for download.
    expect(await dialog.getByLabel('x, metres').inputValue()).toBe('');
    expect(await dialog.getByLabel('y, metres').inputValue()).toBe('');
    expect(await dialog.getByLabel('Spot label').getAttribute('placeholder')).toBe('spot 1');
    await dialog.getByRole('button', { name: 'Fit range / azimuth offsets' }).click();
    const notEntered = page.locator('[data-testid=calibration-refusal]');
    await notEntered.waitFor();
    expect(await notEntered.innerText()).toBe('spot 1: enter its tape-measured x and y (metres) before fitting');
    expect(await page.locator('[data-testid=calibration-result]').count()).toBe(0);
    expect(await dialog.getByRole('button', { name: 'Download proposed bench config' }).count()).toBe(0);

    // A spot where nothing stands (behind the radar, away from every echo of the bay): the
    // calibration API must refuse the fit with a coded message, and the panel show it as it is.
    await dialog.getByLabel('x, metres').fill('2');
    await dialog.getByLabel('y, metres').fill('-2');
    await dialog.getByRole('button', { name: 'Fit range / azimuth offsets' }).click();
    const refusal = page.locator('[data-testid=calibration-error]');
    await refusal.waitFor();
    expect(await refusal.innerText()).toMatch(/^E_[A-Z_]+: .+/);
    expect(await page.locator('[data-testid=calibration-result]').count()).toBe(0);

    // The two rail mounts of bay 3 (bridge/sim/scenarios.ts) as tape-measured spots: a fit, with
    // one residual row per spot, each on the detections gated to it.
    await dialog.getByLabel('Spot label').first().fill('mount west');
    await dialog.getByLabel('x, metres').fill('-1.8');
    await dialog.getByLabel('y, metres').fill('3.05');
    await dialog.getByRole('button', { name: '+ Add spot' }).click();
    await dialog.getByLabel('Spot label').nth(1).fill('mount east');
    await dialog.getByLabel('x, metres').nth(1).fill('1.8');
    await dialog.getByLabel('y, metres').nth(1).fill('3.05');
    await dialog.getByRole('button', { name: 'Fit range / azimuth offsets' }).click();
    await page.locator('[data-testid=calibration-result]').waitFor();
    const spotRows = page.locator('[data-testid=calibration-spots] tbody tr');
    expect(await spotRows.count()).toBe(2);
    const west = (await spotRows.nth(0).locator('td').allInnerTexts()).map((t) => t.trim());
    expect(west[0]).toBe('mount west');
    expect(Number(west[1])).toBeGreaterThanOrEqual(20);
    expect(west[2]).toMatch(/^[+−]\d+\.\d ± \d+\.\d mm/);
    expect(west[3]).toMatch(/^[+−]\d+\.\d\d ± \d+\.\d\d°/);
    // Against what the other mount alone predicts (leave-one-out): the figures behind the marks.
    expect(west[4]).toMatch(/^[+−]\d+\.\d ± \d+\.\d mm/);
    expect(west[5]).toMatch(/^[+−]\d+\.\d\d ± \d+\.\d\d°/);
    // Both spots stand 3.5 m out: the panel says the scale was not fitted.
    await dialog.locator('.warn', { hasText: 'range scale not fitted' }).waitFor();
    await page.locator('[data-testid=calibration-spots]').scrollIntoViewIfNeeded();
    await page.screenshot({ path: join(artifacts, 'dashboard-e2e-calibration.png') });

    // A seek back while capturing: the capture stops at the jump with a note, keeping what came
    // before it, rather than mixing two passes over the same run time.
    const captured = () => Number((/(\d+) detections/.exec(document.querySelector('[data-testid=calibration-capture]')?.textContent ?? '') ?? [])[1]);
    const before = await page.evaluate(captured);
    await dialog.getByRole('button', { name: '● Start capture' }).click();
    await page.waitForFunction((n) => Number((/(\d+) detections/.exec(document.querySelector('[data-testid=calibration-capture]')?.textContent ?? '') ?? [])[1]) > n + 20, before, { timeout: 30_000 });
    await page.evaluate(() => (document.activeElement as HTMLElement | null)?.blur());
    await page.keyboard.press('ArrowLeft');
    const note = dialog.locator('[data-testid=calibration-capture-note]');
    await note.waitFor({ timeout: 30_000 });
    expect(await note.innerText()).toMatch(/^capture stopped: the replay jumped back from \d+\.\d s to \d+\.\d s; kept the \d+ detections captured before the jump\. Fit them, or Clear and capture again$/);
    await dialog.getByRole('button', { name: '● Start capture' }).waitFor();
    const kept = await page.evaluate(captured);
    await page.waitForTimeout(1200);
    expect(await page.evaluate(captured)).toBe(kept);
    await page.keyboard.press('Escape');
  });

  it('falls back to the canvas renderer and still draws the tracks where they are', async () => {
    const second = await browser.newPage({ viewport: { width: 1400, height: 860 } });
    second.on('pageerror', (e) => pageErrors.push(e.message));
    await second.goto(`${bridge.url}${bridge.url.includes('?') ? '&' : '?'}renderer=canvas`);
    await second.waitForFunction(() => window.echotrail?.renderer === 'canvas');
    await second.locator('[data-testid=track-list] tbody tr[data-track-id]').first().waitFor({ timeout: 60_000 });
    if (await second.locator('[data-testid=source-status] [data-state="replay-playing"]').count()) await second.click('[data-testid=play-pause]');
    await second.locator('[data-testid=source-status] [data-state="replay-paused"]').waitFor();
    await checkTrackPixels(second, 'dashboard-e2e-canvas.png');
    await second.close();
  });

  it('opens another session from the picker', async () => {
    const picker = page.locator('[data-testid=session-picker]');
    const option = picker.locator('option', { hasText: 'crossing' });
    await option.waitFor({ state: 'attached' });
    await picker.selectOption(await option.getAttribute('value') ?? '');
    await page.locator('[data-testid=source-status]', { hasText: 'crossing' }).waitFor();
    expect(await page.locator('[data-testid=replay-clock]').innerText()).toMatch(/^0:0\d\.\d/);
    // The select may cut the line short; its tooltip carries all of it (name, start, length, tracks).
    expect(await picker.getAttribute('title')).toMatch(/^bay3-crossing-carriages · \d{4}-\d\d-\d\d \d\d:\d\d — .*tracks?/);
    expect(pageErrors).toEqual([]);
  });
});

/** Finds the most isolated track on screen and checks the screenshot has its colour where it is projected. */
async function checkTrackPixels(page: Page, shotName: string): Promise<{ id: number; x: number; y: number }> {
  await page.keyboard.press('r');
  await page.waitForTimeout(500);
  const target = await page.evaluate(() => {
    const h = window.echotrail!;
    const rect = h.canvasRect();
    const pts = h.trackIds().map((id) => ({ id, p: h.trackPosition(id)! })).map(({ id, p }) => ({ id, s: h.project(p.x, p.y) }));
    // The track farthest from any other on screen, so its symbol is not covered by a neighbour's.
    const inside = pts.filter(({ s }) => s.px > 20 && s.py > 90 && s.px < rect.width - 20 && s.py < rect.height - 120);
    const score = (a: (typeof pts)[number]) => Math.min(...pts.filter((b) => b.id !== a.id).map((b) => Math.hypot(a.s.px - b.s.px, a.s.py - b.s.py)), 1e9);
    inside.sort((a, b) => score(b) - score(a));
    return inside[0] ? { id: inside[0].id, x: rect.left + inside[0].s.px, y: rect.top + inside[0].s.py, corner: { x: rect.left + rect.width - 4, y: rect.top + rect.height - 4 } } : null;
  });
  expect(target).not.toBeNull();
  mkdirSync(artifacts, { recursive: true });
  const png = await page.screenshot({ path: join(artifacts, shotName) });
  const [atTrack, atCorner] = await samplePixels(page, png, [{ x: target!.x, y: target!.y }, target!.corner], 2);
  const want = rgbOf(trackColour(target!.id));
  const best = Math.min(...atTrack.map((p) => colourDistance(p, want)));
  expect(best).toBeLessThan(40);
  // The far corner shows the plain background (outside the coverage): the decode is sound.
  expect(colourDistance(atCorner[0], rgbOf(background))).toBeLessThan(12);
  return target!;
}
