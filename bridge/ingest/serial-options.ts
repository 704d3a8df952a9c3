/** Options of SerialSource (serial-source.ts), with their defaults and checks in one place. */
import { EchotrailError } from '../errors.ts';

export interface SerialSourceOptions {
  /** Device path, e.g. /dev/ttyUSB0 or a socat link. */
  path: string;
  /** Line speed, baud. */
  baudRate: number;
  /** Bits per character. */
  dataBits: 5 | 6 | 7 | 8;
  /** Parity bit. */
  parity: 'none' | 'even' | 'odd' | 'mark' | 'space';
  /** Stop bits. */
  stopBits: 1 | 1.5 | 2;
  /** Longest line accepted, bytes without the newline; longer ones are refused and skipped. */
  maxLineBytes: number;
  /** First wait before reopening a vanished device, ms. */
  reopenInitialMs: number;
  /** Longest wait between reopen attempts, ms (the backoff doubles up to this). */
  reopenMaxMs: number;
  /**
   * While live, how often to check that the device path still exists, ms; 0 = never. A device
   * whose path is gone is treated as unplugged even when the driver raised no 'close'.
   */
  presenceCheckMs: number;
}

const DATA_BITS = [5, 6, 7, 8] as const;
const PARITIES = ['none', 'even', 'odd', 'mark', 'space'] as const;
const STOP_BITS = [1, 1.5, 2] as const;

function oneOf<T>(value: unknown, allowed: readonly T[], what: string): T {
  if (!allowed.includes(value as T)) throw new EchotrailError('E_OPTION', `serial ${what} must be one of ${allowed.join(', ')}, got ${String(value)}`);
  return value as T;
}

export function resolveSerialOptions(o: Partial<SerialSourceOptions> & { path: string }): SerialSourceOptions {
  if (typeof o.path !== 'string' || o.path.length === 0) throw new EchotrailError('E_OPTION', 'serial input needs a device path (e.g. --serial /dev/ttyUSB0)');
  const r: SerialSourceOptions = {
    path: o.path,
    baudRate: o.baudRate ?? 115200,
    dataBits: oneOf(o.dataBits ?? 8, DATA_BITS, 'data bits'),
    parity: oneOf(o.parity ?? 'none', PARITIES, 'parity'),
    stopBits: oneOf(o.stopBits ?? 1, STOP_BITS, 'stop bits'),
    maxLineBytes: o.maxLineBytes ?? 4096,
    reopenInitialMs: o.reopenInitialMs ?? 200,
    reopenMaxMs: o.reopenMaxMs ?? 2000,
    presenceCheckMs: o.presenceCheckMs ?? 1000,
  };
  if (!Number.isInteger(r.baudRate) || r.baudRate <= 0) throw new EchotrailError('E_OPTION', `serial baud rate must be a positive integer, got ${r.baudRate}`);
  if (!Number.isInteger(r.maxLineBytes) || r.maxLineBytes < 64) throw new EchotrailError('E_OPTION', 'serial maxLineBytes must be an integer ≥ 64');
  if (!(r.reopenInitialMs > 0) || !(r.reopenMaxMs >= r.reopenInitialMs)) throw new EchotrailError('E_OPTION', 'serial reopen delays must be positive, the maximum not below the first');
  if (!(r.presenceCheckMs >= 0)) throw new EchotrailError('E_OPTION', 'serial presence check interval must be 0 (off) or a positive number of ms');
  return r;
}
