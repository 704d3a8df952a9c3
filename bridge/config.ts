/**
 * The bench configuration file (`npm start -- --config bench.json`): the settings of one bench
 * that stay the same from run to run. JSON, validated with zod; relative paths are taken from the
 * file's own folder. `calibration` names the calibration file `echotrail calibrate` maintains
 * (format: bridge/calibrate/bench-config.ts; it may also be given inline); its radar offsets become
 * the tracker's measurement corrections. Example:
 *
 *   {
 *     "serial": { "path": "/dev/ttyUSB0", "baudRate": 115200 },
 *     "tracker": { "antenna": "rotating", "intervalS": 0.5 },
 *     "trackerProfile": "profiles/turntable.json",
 *     "calibration": "calibration/bay3.json",
 *     "sessionsDir": "/data/echotrail/sessions",
 *     "bridge": { "port": 8080, "host": "127.0.0.1", "allowedOrigins": [] }
 *   }
 */
import { readFile } from 'node:fs/promises';
import { dirname, resolve } from 'node:path';
import { z } from 'zod';
import { EchotrailError } from './errors.ts';
import type { BridgeOptions } from './server/options.ts';
import { parseBenchConfig as parseCalibration, trackerCorrections, type BenchConfig as Calibration } from './calibrate/bench-config.ts';

const serialSchema = z.strictObject({
  path: z.string().min(1),
  baudRate: z.number().int().positive().default(115200),
  dataBits: z.union([z.literal(5), z.literal(6), z.literal(7), z.literal(8)]).optional(),
  parity: z.enum(['none', 'even', 'odd', 'mark', 'space']).optional(),
  stopBits: z.union([z.literal(1), z.literal(1.5), z.literal(2)]).optional(),
  reopenInitialMs: z.number().positive().optional(),
  reopenMaxMs: z.number().positive().optional(),
});

export const benchConfigSchema = z.strictObject({
  /** Serial input used when `--serial` is not given. */
  serial: serialSchema.optional(),
  /** Tracker options (bridge/tracking/tracker-options.ts), checked by the tracker itself. */
  tracker: z.record(z.string(), z.unknown()).optional(),
  /** A tracker profile file (JSON: tracker options, or `{ "tracker": {...} }`); `tracker` entries win. */
  trackerProfile: z.string().min(1).optional(),
  /** Calibration file (path) or its content inline; checked by bridge/calibrate/bench-config.ts. */
  calibration: z.union([z.string().min(1), z.record(z.string(), z.unknown())]).optional(),
  /** Where live runs are recorded. */
  sessionsDir: z.string().min(1).optional(),
  bridge: z
    .strictObject({
      port: z.number().int().min(0).max(65535).optional(),
      host: z.string().min(1).optional(),
      allowedOrigins: z.array(z.string()).optional(),
      token: z.string().min(8).optional(),
    })
    .optional(),
});
export type BenchConfig = z.infer<typeof benchConfigSchema>;

async function readJson(path: string, what: string): Promise<unknown> {
  let text: string;
  try {
    text = await readFile(path, 'utf8');
  } catch (err) {
    throw new EchotrailError('E_PATH', `cannot read ${what} '${path}': ${(err as NodeJS.ErrnoException).code ?? (err as Error).message}`);
  }
  try {
    return JSON.parse(text);
  } catch (err) {
    throw new EchotrailError('E_OPTION', `${what} '${path}' is not valid JSON: ${(err as Error).message}`);
  }
}

function describeIssues(error: z.ZodError): string {
  return error.issues
    .slice(0, 5)
    .map((i) => `${i.path.join('.') || '(top)'}: ${i.message}`)
    .join('; ');
}

/** Reads and checks a bench config file; paths inside it become absolute. */
export async function loadBenchConfig(path: string): Promise<BenchConfig> {
  const parsed = benchConfigSchema.safeParse(await readJson(path, 'config file'));
  if (!parsed.success) throw new EchotrailError('E_OPTION', `config file '${path}': ${describeIssues(parsed.error)}`);
  const cfg = parsed.data;
  const base = dirname(resolve(path));
  if (cfg.sessionsDir) cfg.sessionsDir = resolve(base, cfg.sessionsDir);
  if (cfg.trackerProfile) cfg.trackerProfile = resolve(base, cfg.trackerProfile);
  if (typeof cfg.calibration === 'string') cfg.calibration = resolve(base, cfg.calibration);
  return cfg;
}

/** The calibration file's content (validated by bridge/calibrate/bench-config.ts), or undefined when none is configured. */
export async function loadCalibration(cfg: BenchConfig): Promise<Calibration | undefined> {
  if (cfg.calibration === undefined) return undefined;
  const json = typeof cfg.calibration === 'string' ? await readJson(cfg.calibration, 'calibration file') : cfg.calibration;
  return parseCalibration(json, typeof cfg.calibration === 'string' ? `calibration file ${cfg.calibration}` : 'calibration (inline)');
}

/** The tracker's range/azimuth corrections from the calibration, or null without one. */
async function calibrationCorrections(cfg: BenchConfig): Promise<{ rangeOffsetM: number; azimuthOffsetRad: number } | null> {
  const calibration = await loadCalibration(cfg);
  return calibration === undefined ? null : trackerCorrections(calibration);
}

/** Tracker options from the profile file, the config's `tracker` entries and the calibration's corrections. */
export async function trackerOptionsFromConfig(cfg: BenchConfig): Promise<Record<string, unknown> | undefined> {
  let options: Record<string, unknown> = {};
  if (cfg.trackerProfile) {
    const profile = await readJson(cfg.trackerProfile, 'tracker profile');
    const inner = z.object({ tracker: z.record(z.string(), z.unknown()) }).safeParse(profile);
    const flat = z.record(z.string(), z.unknown()).safeParse(profile);
    if (inner.success) options = { ...inner.data.tracker };
    else if (flat.success) options = { ...flat.data };
    else throw new EchotrailError('E_OPTION', `tracker profile '${cfg.trackerProfile}' must be a JSON object`);
  }
  if (cfg.tracker) options = { ...options, ...cfg.tracker };
  const corrections = await calibrationCorrections(cfg);
  if (corrections) options.measurement = { ...((options.measurement as Record<string, unknown> | undefined) ?? {}), ...corrections };
  return Object.keys(options).length ? options : undefined;
}

/** The bridge options a config file contributes (command-line options override them). */
export async function bridgeOptionsFromConfig(cfg: BenchConfig): Promise<Partial<BridgeOptions>> {
  const out: Partial<BridgeOptions> = {};
  if (cfg.serial) out.serial = cfg.serial;
  if (cfg.sessionsDir) out.sessionsDir = cfg.sessionsDir;
  if (cfg.bridge?.port !== undefined) out.port = cfg.bridge.port;
  if (cfg.bridge?.host) out.host = cfg.bridge.host;
  if (cfg.bridge?.allowedOrigins) out.allowedOrigins = cfg.bridge.allowedOrigins;
  if (cfg.bridge?.token) out.token = cfg.bridge.token;
  const calibration = await loadCalibration(cfg);
  if (calibration !== undefined) out.calibration = calibration;
  const tracker = await trackerOptionsFromConfig(cfg);
  if (tracker) out.trackerOptions = tracker;
  out.benchConfig = cfg as Record<string, unknown>;
  return out;
}
