import type { ScannerProfile } from '@clearbase/contracts';
import type { FrameLevels, InversionProfile, Rgb } from '@clearbase/inversion';

/** A negative as the previews take it: interleaved 16-bit counts with their film base and scanner. */
export interface PreviewNegative {
  width: number;
  height: number;
  /** Interleaved RGB 16-bit counts. */
  pixels: Uint16Array;
  base: Rgb;
  scanner: ScannerProfile;
}

/** Which half of the before/after preview a rendering is for. */
export type PreviewSide = 'before' | 'after';

/**
 * Sent once: the reference negative (its pixels transferred, not copied), its film base, the scanner the counts
 * come through, and the profile whose auto exposure fixes E_mid for both sides (the saved version's), so a change
 * of balance shows as a change rather than being exposed away.
 */
export interface LoadNegativeMessage {
  kind: 'load';
  width: number;
  height: number;
  /** Interleaved RGB 16-bit counts, width × height × 3. */
  pixels: Uint16Array;
  base: Rgb;
  scanner: ScannerProfile;
  levelsProfile: InversionProfile;
  /** Levels measured elsewhere (the server's, on the full scan): their E_mid is used instead of measuring. */
  levels?: FrameLevels;
}

/** Render the loaded negative through a profile; `id` grows with each request so stale answers can be dropped. */
export interface RenderMessage {
  kind: 'render';
  id: number;
  side: PreviewSide;
  profile: InversionProfile;
}

export type PreviewRequest = LoadNegativeMessage | RenderMessage;

/** The negative is held and measured. */
export interface LoadedReply {
  kind: 'loaded';
  width: number;
  height: number;
  /** E_mid the previews render at, log10 exposure. */
  midLogExposure: number;
  /** Time to measure the negative's levels, ms. */
  measureMs: number;
}

/** A rendering, as canvas pixels (RGBA, 8 bits, transferred), and what it cost. */
export interface RenderedReply {
  kind: 'rendered';
  id: number;
  side: PreviewSide;
  width: number;
  height: number;
  rgba: Uint8ClampedArray;
  /** Building the lookup tables, ms. */
  compileMs: number;
  /** Running the pixels through them into RGBA, ms. */
  renderMs: number;
}

/** A request that could not be done, with a sentence for the screen. */
export interface FailedReply {
  kind: 'failed';
  id: number | null;
  message: string;
}

export type PreviewReply = LoadedReply | RenderedReply | FailedReply;

/** A reply and the buffers to transfer with it. */
export interface PreviewAnswer {
  reply: PreviewReply;
  transfer: Transferable[];
}
