/**
 * What the dashboard may ask of the bridge over the WebSocket, already validated by the zod
 * `clientMessage` schema: replay transport controls, opening a recorded session, the session list.
 * Requests that cannot be carried out throw an EchotrailError, answered to that client as `error`.
 */
import type { ClientMessage, ServerMessage, SessionInfo } from './protocol.ts';
import { EchotrailError } from '../errors.ts';
import type { Pipeline } from './pipeline.ts';

/** What the controls act on. */
export interface ControlContext {
  pipeline: Pipeline;
  /** Opens a session from the sessions folder as the new source. */
  openSession(sessionId: string): Promise<void>;
  /** The session list (recorded and demo sessions). */
  sessions(): Promise<SessionInfo[]>;
}

function need(value: number | undefined, action: string, lo: number, hi: number): number {
  if (value === undefined) throw new EchotrailError('E_PROTOCOL', `control '${action}' needs a value`);
  if (value < lo || value > hi) throw new EchotrailError('E_PROTOCOL', `control '${action}' value ${value} outside ${lo}–${hi}`);
  return value;
}

export async function handleClientMessage(ctx: ControlContext, msg: ClientMessage, reply: (m: ServerMessage) => void): Promise<void> {
  if (msg.type === 'list-sessions') {
    reply({ type: 'sessions', sessions: await ctx.sessions() });
    return;
  }
  if (msg.type === 'open-session') {
    await ctx.openSession(msg.sessionId);
    return;
  }
  const replay = ctx.pipeline.replay;
  if (!replay) throw new EchotrailError('E_PROTOCOL', `control '${msg.action}' needs a replay; the bridge is showing a live source`);
  switch (msg.action) {
    case 'play':
      replay.play();
      break;
    case 'pause':
      replay.pause();
      break;
    case 'step':
      if (msg.value !== undefined) replay.step(need(msg.value, 'step', 0.001, 3600));
      else replay.step();
      break;
    case 'step-back':
      if (msg.value !== undefined) replay.stepBack(need(msg.value, 'step-back', 0.001, 3600));
      else replay.stepBack();
      break;
    case 'seek':
      replay.seek(need(msg.value, 'seek', 0, Number.MAX_SAFE_INTEGER));
      break;
    case 'speed':
      replay.setSpeed(need(msg.value, 'speed', 0.1, 50));
      break;
    case 'loop':
      replay.setLoop(need(msg.value, 'loop', 0, 1) === 1);
      break;
  }
  ctx.pipeline.tickReplay(true);
}
