import { describe, expect, it } from 'vitest';
import { movablePixels } from './movable-pixels';

describe('movablePixels', () => {
  it('copies every count onto a buffer of its own, over several steps', async () => {
    const data = Uint16Array.from({ length: 1000 }, (_, i) => (i * 37) % 65536);
    const copy = await movablePixels(data, 64);
    expect(copy).toEqual(data);
    expect(copy.buffer).not.toBe(data.buffer);
    expect(copy.byteLength).toBe(copy.buffer.byteLength);
  });

  it('lets timers run between steps', async () => {
    let ticks = 0;
    const timer = setInterval(() => ticks++, 0);
    await movablePixels(new Uint16Array(1 << 16), 16);
    clearInterval(timer);
    expect(ticks).toBeGreaterThan(0);
  });

  it('rejects a step that is not a positive integer', async () => {
    await expect(movablePixels(new Uint16Array(4), 0)).rejects.toThrow(
      'Expected positive integer for step but received 0 of type number',
    );
  });
});
