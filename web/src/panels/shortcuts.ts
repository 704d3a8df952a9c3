/**
 * Keyboard shortcuts: one table used both by the key handler and by the help panel, so the
 * list on screen cannot drift from what the keys do.
 */
export type Command =
  | 'play-pause' | 'step' | 'step-back' | 'back' | 'forward' | 'slower' | 'faster' | 'loop'
  | 'fit' | 'reset' | 'grid' | 'fixed' | 'detections' | 'next-track' | 'previous-track'
  | 'deselect' | 'help' | 'safety';

export interface Shortcut { keys: string[]; label: string; command: Command }

export const shortcuts: readonly Shortcut[] = [
  { keys: ['Space'], label: 'Play / pause the replay', command: 'play-pause' },
  { keys: ['.'], label: 'Step forward and pause', command: 'step' },
  { keys: [','], label: 'Step back and pause', command: 'step-back' },
  { keys: ['←'], label: 'Seek 5 s back', command: 'back' },
  { keys: ['→'], label: 'Seek 5 s forward', command: 'forward' },
  { keys: ['['], label: 'Slower replay', command: 'slower' },
  { keys: [']'], label: 'Faster replay', command: 'faster' },
  { keys: ['L'], label: 'Loop the current session on / off', command: 'loop' },
  { keys: ['F'], label: 'Fit view to tracks', command: 'fit' },
  { keys: ['R'], label: 'Reset view to the coverage', command: 'reset' },
  { keys: ['G'], label: 'Metric grid on / off', command: 'grid' },
  { keys: ['E'], label: 'Fixed echoes on / off', command: 'fixed' },
  { keys: ['D'], label: 'Detections on / off', command: 'detections' },
  { keys: ['N'], label: 'Select next track', command: 'next-track' },
  { keys: ['P'], label: 'Select previous track', command: 'previous-track' },
  { keys: ['Esc'], label: 'Clear selection / close dialog', command: 'deselect' },
  { keys: ['?', 'H'], label: 'This help', command: 'help' },
  { keys: ['S'], label: 'Safety note', command: 'safety' },
];

const byKey = new Map<string, Command>([
  [' ', 'play-pause'], ['.', 'step'], [',', 'step-back'], ['ArrowLeft', 'back'], ['ArrowRight', 'forward'], ['[', 'slower'], [']', 'faster'],
  ['l', 'loop'], ['f', 'fit'], ['r', 'reset'], ['g', 'grid'], ['e', 'fixed'], ['d', 'detections'], ['n', 'next-track'],
  ['p', 'previous-track'], ['Escape', 'deselect'], ['?', 'help'], ['h', 'help'], ['s', 'safety'],
]);

/** The command for a key event, or null; modifier chords are left to the browser. */
export function commandFor(e: { key: string; ctrlKey: boolean; metaKey: boolean; altKey: boolean }): Command | null {
  if (e.ctrlKey || e.metaKey || e.altKey) return null;
  return byKey.get(e.key.length === 1 ? e.key.toLowerCase() : e.key) ?? null;
}

/** Replay speed ladder used by [ and ] and the speed selector (the bridge accepts 0.1–50×). */
export const speedSteps = [0.1, 0.25, 0.5, 1, 2, 5, 10, 20, 50] as const;

export function nextSpeed(current: number, direction: 1 | -1): number {
  if (direction > 0) return speedSteps.find((s) => s > current + 1e-9) ?? speedSteps[speedSteps.length - 1];
  return [...speedSteps].reverse().find((s) => s < current - 1e-9) ?? speedSteps[0];
}

/** Next/previous id in a list (wrapping), starting from the first when nothing is selected. */
export function cycleSelection(ids: readonly number[], current: number | null, direction: 1 | -1): number | null {
  if (ids.length === 0) return null;
  const i = current === null ? -1 : ids.indexOf(current);
  if (i < 0) return direction > 0 ? ids[0] : ids[ids.length - 1];
  return ids[(i + direction + ids.length) % ids.length];
}
