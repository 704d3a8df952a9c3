/**
 * The pipeline's one input at a time: attaching a source's listeners, detaching and closing it
 * when it is replaced, and running switches one after the other, so that two dashboards opening
 * sessions at once never leave two sources attached. Kept apart from the pipeline because the
 * listener bookkeeping and the ordering of switches hold whatever the pipeline does with records.
 */
import type { BadLine, Source, SourceRecord, SourceState } from '../ingest/source.ts';

/** What the pipeline does with each event of the attached source. */
export interface SourceHandlers {
  /** A good record, with performance.now() when it arrived or was released. */
  record: (r: SourceRecord, receivedAtMs: number) => void;
  /** A refused line. */
  bad: (b: BadLine) => void;
  /** The source changed state (with a reason, sometimes). */
  state: (s: SourceState, detail?: string) => void;
  /** A replay jumped to `timeS`. */
  seeked: (timeS: number) => void;
  /** The source hit an error it survives (logged). */
  error: (e: Error) => void;
}

type Listener = (...a: never[]) => void;

export class SourceSlot {
  private source: Source | null = null;
  private listeners: [string, Listener][] = [];
  private switching: Promise<void> = Promise.resolve();

  /** `log` takes a failure to close a replaced source. */
  constructor(private readonly log: (line: string) => void) {}

  get current(): Source | null {
    return this.source;
  }

  /**
   * Runs `fn` once every switch asked before it has settled, and returns its outcome; a switch
   * that fails does not stop the ones queued after it.
   */
  serialise(fn: () => Promise<void>): Promise<void> {
    const run = this.switching.then(fn);
    this.switching = run.catch(() => undefined);
    return run;
  }

  /** Makes `source` the current one and routes its events to `handlers`. Detach the previous one first. */
  attach(source: Source, handlers: SourceHandlers): void {
    this.source = source;
    this.listen(source, 'record', handlers.record);
    this.listen(source, 'bad', handlers.bad);
    this.listen(source, 'state', handlers.state);
    this.listen(source, 'seeked', handlers.seeked);
    this.listen(source, 'error', handlers.error);
  }

  /** Removes the current source's listeners and closes it; a failure to close is logged, never thrown. */
  async detach(): Promise<void> {
    const old = this.source;
    this.source = null;
    if (old) {
      for (const [ev, fn] of this.listeners) old.off(ev, fn as (...a: unknown[]) => void);
      // Keep listening for errors: a late 'error' with no listener would crash the process.
      old.on('error', () => undefined);
      await old.close().catch((e: Error) => this.log(`closing ${old.name}: ${e.message}`));
    }
    this.listeners = [];
  }

  private listen(src: Source, ev: string, fn: Listener): void {
    src.on(ev, fn as (...a: unknown[]) => void);
    this.listeners.push([ev, fn]);
  }
}
