/** One entry of a zip's central directory. */
export interface ZipEntry {
  name: string;
  /** 0: stored, 8: deflated (APPNOTE 4.4.5). */
  method: number;
  compressedSize: number;
  size: number;
}

// record signatures of the zip format: PKWARE APPNOTE.TXT 4.3.16 and 4.3.12
const endOfCentralDirectory = 0x06054b50;
const centralDirectoryHeader = 0x02014b50;

/**
 * Lists a zip's entries from its central directory, for checking what a download holds. Reads plain zips only (no
 * zip64, no archive comment longer than 64 KiB); throws on anything else.
 *
 * @example
 * const names = zipEntries(bytes).map((e) => e.name); // ['roll-1/scan-01.jpg', …]
 */
export function zipEntries(bytes: Uint8Array): ZipEntry[] {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  // the end record is 22 bytes plus a comment of at most 65535 (APPNOTE 4.3.16)
  const lowest = Math.max(0, bytes.length - 22 - 0xffff);
  let end = -1;
  for (let i = bytes.length - 22; i >= lowest; i--) {
    if (view.getUint32(i, true) === endOfCentralDirectory) {
      end = i;
      break;
    }
  }
  if (end < 0) throw new Error('Expected a zip archive but found no end of central directory record');
  const count = view.getUint16(end + 10, true);
  let at = view.getUint32(end + 16, true);
  const entries: ZipEntry[] = [];
  const decoder = new TextDecoder();
  for (let n = 0; n < count; n++) {
    if (view.getUint32(at, true) !== centralDirectoryHeader) {
      throw new Error(`Expected a central directory header at byte ${at}`);
    }
    const nameLength = view.getUint16(at + 28, true);
    const extraLength = view.getUint16(at + 30, true);
    const commentLength = view.getUint16(at + 32, true);
    entries.push({
      method: view.getUint16(at + 10, true),
      compressedSize: view.getUint32(at + 20, true),
      size: view.getUint32(at + 24, true),
      name: decoder.decode(bytes.subarray(at + 46, at + 46 + nameLength)),
    });
    at += 46 + nameLength + extraLength + commentLength;
  }
  return entries;
}
