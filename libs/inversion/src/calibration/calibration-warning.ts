/** What a calibration warns about. */
export type CalibrationWarningCode =
  | 'too-few-brackets'
  | 'clipped-frame'
  | 'blank-frame'
  | 'below-toe'
  | 'non-monotone'
  | 'speed-point-extrapolated'
  | 'clipped-patch'
  | 'badly-lit-chart'
  | 'large-residuals'
  | 'memorised-chart';

/** A warning of a calibration: a code to act on, a message a person can read, and what it concerns. */
export interface CalibrationWarning {
  code: CalibrationWarningCode;
  /** 'warning': the profile may be wrong, check before saving; 'notice': worth knowing, the fit is sound. */
  severity: 'warning' | 'notice';
  message: string;
  /** Index into the bracket frames, when the warning is about one frame. */
  frame?: number;
  /** The channel, when the warning is about one. */
  channel?: 'red' | 'green' | 'blue';
  /** Chart patch index (1-based), when the warning is about one patch. */
  patch?: number;
}

/**
 * Fewest usable grey frames for a trustworthy curve: 3 points on the straight part (so a line has a
 * residual at all) and at least one in each of toe and shoulder (chosen, from the curve's shape).
 */
export const MIN_BRACKET_FRAMES = 5;
/** A grey frame within this density of the base in every channel never saw light (about the scatter of base density along a roll; from memory). */
export const BLANK_DENSITY = 0.02;
/** Mean |Δa*| or |Δb*| of the chart's neutral row above this: the chart was lit unlike the grey card (chosen, about the just-noticeable cast of a print; from memory). */
export const NEUTRAL_CAST_LIMIT = 3;
/** RMS density residual above this is a poor fit (common practice choice: about the repeatability of a densitometer reading on film; from memory). */
export const RESIDUAL_LIMIT = 0.03;
/**
 * Cross-validated mean ΔE00 more than this above the training mean: the colour matrices memorise the chart (chosen:
 * half of a ΔE00 of 1, about a just-noticeable difference side by side, so a profile within ΔE00 1 on the chart it
 * was fitted to still predicts colours it never saw within 1.5).
 */
export const CROSS_VALIDATION_GAP_LIMIT = 0.5;
