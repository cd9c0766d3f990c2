import { describe, expect, it } from 'vitest';
import { createFrameBuffers } from './frame-buffers';

describe('frame buffers', () => {
  it('hands a released buffer out again for the same kind and length, and a new one otherwise', () => {
    const buffers = createFrameBuffers();
    const a = buffers.acquire(Uint16Array, 30);
    expect(a.buffer).toBeInstanceOf(SharedArrayBuffer);
    buffers.release(a);
    expect(buffers.acquire(Uint8Array, 30)).not.toBe(a);
    expect(buffers.acquire(Uint16Array, 31)).not.toBe(a);
    expect(buffers.acquire(Uint16Array, 30)).toBe(a);
    expect(buffers.acquire(Uint16Array, 30)).not.toBe(a);
  });

  it('keeps no more idle buffers than asked', () => {
    const buffers = createFrameBuffers(1);
    const a = buffers.acquire(Uint8Array, 3);
    const b = buffers.acquire(Uint8Array, 3);
    buffers.release(a);
    buffers.release(b);
    expect(buffers.acquire(Uint8Array, 3)).toBe(b);
    expect(buffers.acquire(Uint8Array, 3)).not.toBe(a);
  });
});
