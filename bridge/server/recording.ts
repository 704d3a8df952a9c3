/**
 * The recording of a live run, as the pipeline sees it: opened with the source, written record by
 * record, closed with it. A failure (disk full, folder gone) stops the recording, never the live
 * view: the reason goes into the source status and to `onFailure`, once.
 */
import type { Source, SourceRecord } from '../ingest/source.ts';
import type { RecorderLike } from './deps.ts';
import type { SourceStats } from './source-stats.ts';

/** Opens a recorder for a source; `onError` is called when it stops on an error later. */
export type OpenRecorder = (source: Source, onError: (message: string) => void) => RecorderLike | Promise<RecorderLike>;

export class RecordingSlot {
  private recorder: RecorderLike | null = null;

  constructor(
    private readonly open: OpenRecorder | null,
    private readonly stats: SourceStats,
    private readonly log: (line: string) => void,
    private readonly onFailure: (message: string) => void,
  ) {}

  get active(): boolean {
    return this.recorder !== null;
  }

  /** Starts recording `source` when recording is configured; a failure to open is reported, not thrown. */
  async start(source: Source): Promise<void> {
    if (!this.open) return;
    try {
      this.recorder = await this.open(source, (message) => this.failed(message));
      this.stats.recording = this.recorder.name;
    } catch (err) {
      // A live view without a recording is still useful: say why and keep going.
      this.refused(err as Error);
    }
  }

  /**
   * Closes the current file and opens the next one without a gap, when the recorder opens
   * synchronously (the session recorder does): records of the same serial chunk go to the new file.
   */
  rotate(source: Source): void {
    if (!this.open) return;
    const old = this.recorder;
    this.recorder = null;
    void old?.close().catch((e: Error) => this.log(`closing recording ${old.name}: ${e.message}`));
    this.stats.recording = null;
    try {
      const next = this.open(source, (message) => this.failed(message));
      if (next instanceof Promise) {
        void next.then((rec) => ((this.recorder = rec), (this.stats.recording = rec.name)), (err: Error) => this.refused(err));
      } else {
        this.recorder = next;
        this.stats.recording = next.name;
      }
    } catch (err) {
      this.refused(err as Error);
    }
  }

  private refused(err: Error): void {
    this.stats.recordingError = err.message;
    this.log(`recording disabled: ${err.message}`);
  }

  write(r: SourceRecord): void {
    if (!this.recorder) return;
    try {
      this.recorder.write(r);
    } catch (err) {
      this.failed((err as Error).message);
    }
  }

  async close(): Promise<void> {
    const rec = this.recorder;
    this.recorder = null;
    this.stats.recording = null;
    await rec?.close().catch((e: Error) => this.log(`closing recording ${rec.name}: ${e.message}`));
  }

  private failed(message: string): void {
    if (!this.recorder) return;
    this.stats.recordingError = message;
    this.log(`recording stopped: ${message}`);
    void this.close();
    this.onFailure(message);
  }
}
