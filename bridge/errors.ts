/**
 * Errors that reach a user. Each has a stable code (for tests, logs and the dashboard) and a
 * message that says what went wrong and, where possible, what to do about it.
 */
export const ERROR_CODES = [
  'E_INPUT_EMPTY',
  'E_INPUT_COLUMNS',
  'E_INPUT_ROW',
  'E_INPUT_UNITS',
  'E_OPTION',
  'E_SERIAL',
  'E_SESSION_FORMAT',
  'E_RECORDING',
  'E_PATH',
  'E_CALIBRATION',
  'E_PROTOCOL',
  /** A fault of echotrail itself, not of the input: the message is the program's own. */
  'E_INTERNAL',
] as const;
export type ErrorCode = (typeof ERROR_CODES)[number];

/** True when `v` is one of the codes (a code that came over a thread or process boundary). */
export function isErrorCode(v: unknown): v is ErrorCode {
  return (ERROR_CODES as readonly unknown[]).includes(v);
}

export class EchotrailError extends Error {
  readonly code: ErrorCode;
  constructor(code: ErrorCode, message: string, options?: { cause?: unknown }) {
    super(message, options);
    this.name = 'EchotrailError';
    this.code = code;
  }
}

/** True when `err` is an EchotrailError with the given code. */
export function hasCode(err: unknown, code: ErrorCode): boolean {
  return err instanceof EchotrailError && err.code === code;
}
