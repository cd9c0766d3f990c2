import { describe, expect, it } from 'vitest';
import { createKeyedLock } from './keyed-lock';

const pause = (ms: number) => new Promise((r) => setTimeout(r, ms));

describe('createKeyedLock', () => {
  it('runs tasks of one key one after another, in the order asked', async () => {
    const lock = createKeyedLock();
    const seen: string[] = [];
    const task = (name: string, ms: number) => async () => {
      seen.push(`${name} start`);
      await pause(ms);
      seen.push(`${name} end`);
      return name;
    };
    const results = await Promise.all([lock('a', task('one', 20)), lock('a', task('two', 1))]);
    expect(results).toEqual(['one', 'two']);
    expect(seen).toEqual(['one start', 'one end', 'two start', 'two end']);
  });

  it('runs tasks of different keys side by side', async () => {
    const lock = createKeyedLock();
    const seen: string[] = [];
    await Promise.all([
      lock('a', async () => {
        seen.push('a start');
        await pause(20);
        seen.push('a end');
      }),
      lock('b', async () => {
        seen.push('b start');
        await pause(1);
        seen.push('b end');
      }),
    ]);
    expect(seen).toEqual(['a start', 'b start', 'b end', 'a end']);
  });

  it('goes on with the next task after one fails, and hands the failure to its caller', async () => {
    const lock = createKeyedLock();
    const failed = lock('a', () => Promise.reject(new Error('refused')));
    const next = lock('a', () => Promise.resolve('next'));
    await expect(failed).rejects.toThrow('refused');
    await expect(next).resolves.toBe('next');
  });
});
