/** Container formats recognised from their first bytes. */
export type SniffedFormat = 'tiff' | 'png' | 'jpeg' | 'unknown';

// Signatures: TIFF 6.0 section 2 (II*\0 / MM\0*, and BigTIFF's 43), PNG spec 5.2, JPEG SOI marker (ITU T.81 B.1.1.3).
const PNG_SIGNATURE = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];

/**
 * Names the container a file claims to be from its first bytes, without decoding anything. Used to
 * tell a damaged image (right signature, unreadable body) from a file that is no image at all.
 */
export function sniffFormat(head: Uint8Array): SniffedFormat {
  const at = (i: number) => head[i] ?? -1;
  if (
    (at(0) === 0x49 && at(1) === 0x49 && (at(2) === 0x2a || at(2) === 0x2b) && at(3) === 0) ||
    (at(0) === 0x4d && at(1) === 0x4d && at(2) === 0 && (at(3) === 0x2a || at(3) === 0x2b))
  ) {
    return 'tiff';
  }
  if (PNG_SIGNATURE.every((b, i) => at(i) === b)) return 'png';
  if (at(0) === 0xff && at(1) === 0xd8 && at(2) === 0xff) return 'jpeg';
  return 'unknown';
}
