/**
 * `calibrationApi(request)`: the calibration tools as one pure function (no files, no clock
 * besides the date stamped into the proposed config), mounted by the web server at
 * POST /api/calibrate for the dashboard's guided panel. Nothing is saved here: a successful
 * answer carries the proposed bench config (and, for tuning, the profile), and the caller stores
 * them when the user accepts.
 *
 * Request (JSON, validated; degrees at this edge):
 *   { action: 'steps' }                                   → the panel's guide text
 *   { action: 'offsets', positions: [{ x, y, label?, fromS?, toS? }], detections: Det[],
 *     fitScale?: 'auto' | boolean, gateRangeM?, gateAzimuthDeg?, config?: BenchConfig, measuredBy? }
 *   { action: 'frame', detections?: Det[], track?: [{ timeS, x, y }], commanded: [{ timeS, x, y }],
 *     gateM?, allowCollinear?, config?, measuredBy? }
 *     (detections are corrected with config's offsets and gated around the path as config aligns
 *     it; a track — radar-frame positions of one target, e.g. its measurements — is used whole)
 *   { action: 'tune', detections: Det[], commanded: [...], filter?: 'kalman' | 'imm', gateM?,
 *     config?, measuredBy?, profileName? }
 *   { action: 'nis-bounds', count, dof? }
 *   where Det = { timeS, azimuthDeg, rangeM, amplitude? }.
 * Response (angles in degrees, lengths in metres):
 *   steps      → { ok, action, steps: string[] }
 *   offsets    → { ok, action, summary: { rangeOffsetM, rangeOffsetSeM, rangeScale, rangeScaleSe,
 *                 azimuthOffsetDeg, azimuthOffsetSeDeg, sigmaRangeM, sigmaAzimuthDeg, detectionsUsed },
 *                 reflectors: [{ label, trueRangeM, trueAzimuthDeg, detections, meanRangeResidualM,
 *                 stdRangeResidualM, meanAzimuthResidualDeg, stdAzimuthResidualDeg,
 *                 deletedRangeResidualM?, deletedRangeSdM?, deletedAzimuthResidualDeg?,
 *                 deletedAzimuthSdDeg? (leave-one-out: measured − predicted by the other spots),
 *                 rangeVerdict, azimuthVerdict ('consistent' | 'inconsistent' | 'disagree' |
 *                 'unchecked'), rangeBeyondNoise, azimuthBeyondNoise (verdict 'inconsistent') }],
 *                 warnings: string[], config }
 *                 A spot seen in fewer revolutions than the guide asks (guide.ts) is refused.
 *   frame      → { ok, action, summary: { rotationDeg, rotationSeDeg, translationXM, translationYM,
 *                 translationSeXM, translationSeYM, rmsM, maxM, pairs, candidates }, warnings, config }
 *   tune       → { ok, action, summary: { samples, sigmaRangeM, sigmaAzimuthDeg, rangeBiasM,
 *                 azimuthBiasDeg, nisMean, nisLower, nisUpper, nisVerdict, defaultNisMean,
 *                 defaultNisVerdict, bracketed }, profile (bridge/tracking/profile.ts format),
 *                 warnings: string[], config }
 *   nis-bounds → { ok, action, lower, upper }
 *   failure    → { ok: false, code: ErrorCode | 'E_PROTOCOL', message } (nothing to save)
 *   `config` is the proposed bench config (bench-config.ts) with the new values and a history entry.
 */
import { z } from 'zod';
import { EchotrailError } from '../errors.ts';
import type { Detection } from '../types.ts';
import { benchConfigSchema, correctDetection, defaultBenchConfig, withCalibration, type BenchConfig } from './bench-config.ts';
import { alignFrame, frameWarnings } from './frame-align.ts';
import { nisBounds } from './nis.ts';
import { tuneNoise } from './noise-tuning.ts';
import { fitRadarOffsets, spotFlags, type ReflectorResidual } from './offsets.ts';
import { tunedProfile } from './profile-out.ts';
import { GUIDE_STEPS, frameRecord, offsetsRecord, offsetsSummary, frameSummary, noiseRecord } from './report.ts';

const DEG = Math.PI / 180;
const det = z.object({ timeS: z.number().finite().min(0), azimuthDeg: z.number().finite(), rangeM: z.number().finite().min(0), amplitude: z.number().positive().optional() });
const dets = z.array(det).max(500_000);
const timed = z.array(z.object({ timeS: z.number().finite(), x: z.number().finite(), y: z.number().finite() })).min(2).max(500_000);
const common = { config: benchConfigSchema.optional(), measuredBy: z.string().min(1).max(200).optional() };

const requestSchema = z.discriminatedUnion('action', [
  z.object({ action: z.literal('steps') }),
  z.object({
    action: z.literal('offsets'), ...common, detections: dets,
    positions: z.array(z.object({ x: z.number().finite(), y: z.number().finite(), label: z.string().max(80).optional(), fromS: z.number().optional(), toS: z.number().optional() })).min(1).max(50),
    fitScale: z.union([z.literal('auto'), z.boolean()]).optional(), gateRangeM: z.number().positive().optional(), gateAzimuthDeg: z.number().positive().optional(),
  }),
  z.object({ action: z.literal('frame'), ...common, detections: dets.optional(), track: timed.optional(), commanded: timed, gateM: z.number().positive().optional(), allowCollinear: z.boolean().optional() })
    .refine((r) => (r.detections === undefined) !== (r.track === undefined), { message: 'give either detections or track', path: ['detections'] }),
  z.object({ action: z.literal('tune'), ...common, detections: dets, commanded: timed, filter: z.enum(['kalman', 'imm']).optional(), gateM: z.number().positive().optional(), profileName: z.string().optional() }),
  z.object({ action: z.literal('nis-bounds'), count: z.number().int().min(1).max(10_000_000), dof: z.number().int().min(1).max(10).optional() }),
]);

export type CalibrationRequest = z.infer<typeof requestSchema>;

export type CalibrationResponse =
  | { ok: true; action: 'steps'; steps: string[] }
  | { ok: true; action: 'offsets'; summary: Record<string, number>; reflectors: Record<string, number | string | boolean>[]; warnings: string[]; config: BenchConfig }
  | { ok: true; action: 'frame'; summary: Record<string, number>; warnings: string[]; config: BenchConfig }
  | { ok: true; action: 'tune'; summary: Record<string, number | string | boolean>; profile: unknown; warnings: string[]; config: BenchConfig }
  | { ok: true; action: 'nis-bounds'; lower: number; upper: number }
  | { ok: false; code: string; message: string };

/**
 * One spot's residuals for the answer, degrees at this edge, with the verdicts of the fit's
 * leave-one-out check: the same figures its warnings quote, so the panel's marks and the warnings
 * name the same spots. The deleted residuals are left out when the other spots cannot predict it.
 */
function reflectorRow(r: ReflectorResidual): Record<string, number | string | boolean> {
  const flags = spotFlags(r);
  return {
    label: r.label, trueRangeM: r.trueRangeM, trueAzimuthDeg: r.trueAzimuthRad / DEG, detections: r.detections,
    meanRangeResidualM: r.meanRangeResidualM, stdRangeResidualM: r.stdRangeResidualM,
    meanAzimuthResidualDeg: r.meanAzimuthResidualRad / DEG, stdAzimuthResidualDeg: r.stdAzimuthResidualRad / DEG,
    ...(r.deletedRangeResidualM !== null && r.deletedRangeSdM !== null ? { deletedRangeResidualM: r.deletedRangeResidualM, deletedRangeSdM: r.deletedRangeSdM } : {}),
    ...(r.deletedAzimuthResidualRad !== null && r.deletedAzimuthSdRad !== null ? { deletedAzimuthResidualDeg: r.deletedAzimuthResidualRad / DEG, deletedAzimuthSdDeg: r.deletedAzimuthSdRad / DEG } : {}),
    rangeVerdict: r.rangeVerdict, azimuthVerdict: r.azimuthVerdict,
    rangeBeyondNoise: flags.range, azimuthBeyondNoise: flags.azimuth,
  };
}

const toDetection = (d: z.infer<typeof det>): Detection => ({ timeS: d.timeS, azimuthRad: ((((d.azimuthDeg % 360) + 360) % 360) * DEG) % (2 * Math.PI), rangeM: d.rangeM, amplitude: d.amplitude ?? 1 });
const sorted = (v: Detection[]) => [...v].sort((a, b) => a.timeS - b.timeS);

export function calibrationApi(request: unknown): CalibrationResponse {
  const parsed = requestSchema.safeParse(request);
  if (!parsed.success) {
    const i = parsed.error.issues[0];
    return { ok: false, code: 'E_PROTOCOL', message: `calibration request: ${i.path.join('.') || '(top level)'}: ${i.message}` };
  }
  const req = parsed.data;
  try {
    const now = new Date().toISOString();
    switch (req.action) {
      case 'steps':
        return { ok: true, action: 'steps', steps: GUIDE_STEPS };
      case 'nis-bounds':
        return { ok: true, action: 'nis-bounds', ...nisBounds(req.count, req.dof ?? 2) };
      case 'offsets': {
        const config = req.config ?? defaultBenchConfig();
        const fit = fitRadarOffsets(req.positions, req.detections.map(toDetection), { fitScale: req.fitScale, gateRangeM: req.gateRangeM, gateAzimuthDeg: req.gateAzimuthDeg });
        const next = withCalibration(config, { radar: { ...config.radar, rangeOffsetM: fit.rangeOffsetM, rangeScale: fit.rangeScale, azimuthOffsetDeg: fit.azimuthOffsetRad / DEG } }, offsetsRecord(fit, req.measuredBy ?? 'dashboard', now, req.positions.length));
        return { ok: true, action: 'offsets', summary: offsetsSummary(fit), reflectors: fit.reflectors.map(reflectorRow), warnings: fit.warnings, config: next };
      }
      case 'frame': {
        const config = req.config ?? defaultBenchConfig();
        const observed = req.track ?? sorted((req.detections ?? []).map(toDetection)).map((d) => correctDetection(d, config)).map((d) => ({ timeS: d.timeS, x: d.rangeM * Math.sin(d.azimuthRad), y: d.rangeM * Math.cos(d.azimuthRad) }));
        const initial = req.track ? null : { rotationRad: config.positionerFrame.rotationDeg * DEG, translation: config.positionerFrame.translationM };
        const fit = alignFrame(observed, req.commanded, { initial, gateM: req.gateM, allowCollinear: req.allowCollinear });
        const next = withCalibration(config, { positionerFrame: { rotationDeg: fit.rotationRad / DEG, translationM: fit.translation } }, frameRecord(fit, req.measuredBy ?? 'dashboard', now));
        return { ok: true, action: 'frame', summary: frameSummary(fit), warnings: frameWarnings(fit), config: next };
      }
      case 'tune': {
        const config = req.config ?? defaultBenchConfig();
        const result = tuneNoise(sorted(req.detections.map(toDetection)), req.commanded, config, { filter: req.filter, gateM: req.gateM });
        const who = req.measuredBy ?? 'dashboard';
        const { profile, warnings } = tunedProfile(result, config, { name: req.profileName ?? 'tuned', measuredBy: who, run: 'dashboard upload', dateUtc: now });
        const next = withCalibration(config, { radar: { ...config.radar, sigmaRangeM: result.sigmaRangeM, sigmaAzimuthDeg: result.sigmaAzimuthRad / DEG } }, noiseRecord(result, who, now));
        return {
          ok: true, action: 'tune', profile, warnings, config: next,
          summary: {
            samples: result.samples, sigmaRangeM: result.sigmaRangeM, sigmaAzimuthDeg: result.sigmaAzimuthRad / DEG, rangeBiasM: result.rangeBiasM, azimuthBiasDeg: result.azimuthBiasRad / DEG,
            nisMean: result.nisTuned.mean, nisLower: result.nisTuned.lower, nisUpper: result.nisTuned.upper, nisVerdict: result.nisTuned.verdict,
            defaultNisMean: result.nisDefault.mean, defaultNisVerdict: result.nisDefault.verdict, bracketed: result.bracketed,
          },
        };
      }
    }
  } catch (err) {
    if (err instanceof EchotrailError) return { ok: false, code: err.code, message: err.message };
    throw err;
  }
}
