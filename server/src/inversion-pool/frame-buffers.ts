/**
 * Reusable shared frame buffers. Memory of a SharedArrayBuffer seen by worker threads is only
 * freed once every thread has collected its handle, and idle workers rarely collect; allocating
 * fresh buffers per frame therefore grows without bound over a roll. Reusing them keeps memory flat.
 */
export interface FrameBuffers {
  acquire(kind: Uint8ArrayConstructor, length: number): Uint8Array;
  acquire(kind: Uint16ArrayConstructor, length: number): Uint16Array;
  acquire(kind: Uint8ArrayConstructor | Uint16ArrayConstructor, length: number): Uint8Array | Uint16Array;
  /** Gives a buffer back; it may be handed out again by the next `acquire` of the same kind and length. */
  release(array: Uint8Array | Uint16Array): void;
}

/** A free list of shared buffers; keeps at most `keep` idle buffers (default 6). */
export function createFrameBuffers(keep = 6): FrameBuffers {
  const free: (Uint8Array | Uint16Array)[] = [];
  function acquire(
    kind: Uint8ArrayConstructor | Uint16ArrayConstructor,
    length: number,
  ): Uint8Array | Uint16Array {
    const i = free.findIndex((a) => a.constructor === kind && a.length === length);
    if (i >= 0) return free.splice(i, 1)[0]!;
    const buffer = new SharedArrayBuffer(length * kind.BYTES_PER_ELEMENT);
    return kind === Uint8Array ? new Uint8Array(buffer) : new Uint16Array(buffer);
  }
  return {
    acquire: acquire as FrameBuffers['acquire'],
    release(array) {
      free.push(array);
      if (free.length > keep) free.shift();
    },
  };
}
