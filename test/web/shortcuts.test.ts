import { describe, expect, it } from 'vitest';
import { commandFor, cycleSelection, nextSpeed, shortcuts, speedSteps } from '../../web/src/panels/shortcuts.ts';

const key = (k: string, mods: Partial<{ ctrlKey: boolean; metaKey: boolean; altKey: boolean }> = {}) =>
  ({ key: k, ctrlKey: false, metaKey: false, altKey: false, ...mods });

describe('keyboard shortcuts', () => {
  it('maps keys to commands, case-insensitively, and leaves chords alone', () => {
    expect(commandFor(key(' '))).toBe('play-pause');
    expect(commandFor(key('F'))).toBe('fit');
    expect(commandFor(key('ArrowLeft'))).toBe('back');
    // The step pair sits side by side, as < and > do on the keyboard.
    expect(commandFor(key('.'))).toBe('step');
    expect(commandFor(key(','))).toBe('step-back');
    expect(commandFor(key('r', { ctrlKey: true }))).toBeNull();
    expect(commandFor(key('z'))).toBeNull();
  });

  it('lists every command the keys can trigger in the help table', () => {
    const listed = new Set(shortcuts.map((s) => s.command));
    for (const k of [' ', '.', ',', 'ArrowLeft', 'ArrowRight', '[', ']', 'l', 'f', 'r', 'g', 'e', 'd', 'n', 'p', 'Escape', '?', 'h', 's']) {
      const c = commandFor(key(k));
      expect(c).not.toBeNull();
      expect(listed.has(c!)).toBe(true);
    }
  });

  it('gives each command one line of the help and each key one command', () => {
    const commands = shortcuts.map((s) => s.command);
    expect(new Set(commands).size).toBe(commands.length);
    const keys = shortcuts.flatMap((s) => s.keys);
    expect(new Set(keys).size).toBe(keys.length);
    expect(shortcuts.find((s) => s.command === 'step-back')).toMatchObject({ keys: [','], label: 'Step back and pause' });
  });

  it('steps the replay speed along the ladder within the bridge limits', () => {
    expect(nextSpeed(1, 1)).toBe(2);
    expect(nextSpeed(1, -1)).toBe(0.5);
    expect(nextSpeed(50, 1)).toBe(50);
    expect(nextSpeed(0.1, -1)).toBe(0.1);
    expect(nextSpeed(3, 1)).toBe(5);
    expect(speedSteps[0]).toBe(0.1);
    expect(speedSteps[speedSteps.length - 1]).toBe(50);
  });

  it('cycles the selection through the list order', () => {
    expect(cycleSelection([4, 2, 9], null, 1)).toBe(4);
    expect(cycleSelection([4, 2, 9], 9, 1)).toBe(4);
    expect(cycleSelection([4, 2, 9], 4, -1)).toBe(9);
    expect(cycleSelection([], 4, 1)).toBeNull();
  });
});
