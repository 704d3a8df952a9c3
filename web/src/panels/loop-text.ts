/**
 * What "⟲ Loop session" does, in words for its tooltip: it repeats the current session only; when
 * the bridge plays a list of sessions (the demo), the tooltip also says what the list does when
 * the loop is off, so nobody has to guess which of the two loops the button means.
 */
import type { ReplayState } from '../../../bridge/server/protocol.ts';

export function loopTitle(r: Pick<ReplayState, 'loop' | 'playlist'>): string {
  const now = r.loop ? 'On: this session starts over when it ends.' : 'Off: this session stops at its end.';
  let list = '';
  if (r.playlist) {
    const next = r.playlist.loops ? 'after the last one the list starts over' : 'the list stops after the last one';
    list = r.loop
      ? ` The demo list (session ${r.playlist.index + 1} of ${r.playlist.count}) waits until the loop is off.`
      : ` Then the demo list moves on to the next session (this is ${r.playlist.index + 1} of ${r.playlist.count}; ${next}).`;
  }
  return `Loop the current session (L). ${now}${list}`;
}
