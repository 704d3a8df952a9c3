/**
 * Plays several replays in turn (the demo sessions of `npm start`): when one ends the next is
 * opened, and with `loop` the list starts over. Stops for good as soon as someone picks a session
 * by hand, so the dashboard's choice is never overridden.
 */
import type { Source, SourceState } from '../ingest/source.ts';

export class Playlist {
  private index = 0;
  private stopped = false;
  private switching = false;

  constructor(
    private readonly paths: string[],
    private readonly loop: boolean,
    private readonly open: (path: string) => Promise<Source>,
    private readonly use: (source: Source) => Promise<void>,
    private readonly log: (line: string) => void,
  ) {}

  /** Called with every state of the current source. */
  onState(state: SourceState): void {
    if (state !== 'ended' || this.stopped || this.switching) return;
    const next = this.index + 1;
    if (next >= this.paths.length && !this.loop) return;
    this.index = next % this.paths.length;
    this.switching = true;
    // Let the 'ended' state reach the clients before the next session replaces it.
    setTimeout(() => void this.advance(), 500).unref();
  }

  private async advance(): Promise<void> {
    try {
      if (this.stopped) return;
      const source = await this.open(this.paths[this.index]);
      if (this.stopped) return void (await source.close());
      await this.use(source);
    } catch (err) {
      this.log(`playlist: cannot play '${this.paths[this.index]}': ${(err as Error).message}`);
    } finally {
      this.switching = false;
    }
  }

  /** This session's place in the list, or null once someone picked a session by hand. */
  info(): { index: number; count: number; loops: boolean } | null {
    return this.stopped ? null : { index: this.index, count: this.paths.length, loops: this.loop };
  }

  stop(): void {
    this.stopped = true;
  }
}
