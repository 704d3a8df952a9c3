/**
 * How much to record per tape-measured spot: the figures the guided panel's steps tell the user
 * (report.ts GUIDE_STEPS) and the offset fit then holds the capture to (offsets.ts), in one place
 * so the instructions and the refusal cannot drift apart. Imported by web/ too: no Node imports.
 *
 * Twenty looks per spot put the standard error of a spot's mean at σ/√20 ≈ 0.22σ, small beside
 * the tape's own centimetre (common practice for a bench calibration, not a published figure).
 */

/** Least antenna revolutions in which each spot must be seen, rotating antenna. */
export const MIN_REVOLUTIONS_PER_SPOT = 20;

/** Least span of each spot's detections with a staring antenna, s. */
export const MIN_STARING_S_PER_SPOT = 10;
