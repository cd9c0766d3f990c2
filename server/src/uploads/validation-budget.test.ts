import { describe, expect, it } from 'vitest';
import { createValidationBudget } from './validation-budget';

/** A piece of work that runs until `finish` is called, noting when it started. */
function gate(log: string[], name: string) {
  let finish!: (fail?: Error) => void;
  const done = new Promise<string>((resolve, reject) => {
    finish = (fail) => (fail ? reject(fail) : resolve(name));
  });
  return {
    work: () => {
      log.push(`${name} started`);
      return done;
    },
    finish: (fail?: Error) => finish(fail),
  };
}

const settle = () => new Promise((resolve) => setTimeout(resolve, 0));

describe('the upload validation budget', () => {
  it('lets validations that fit together run at once', async () => {
    const budget = createValidationBudget(100);
    const log: string[] = [];
    const [a, b] = [gate(log, 'a'), gate(log, 'b')];
    const runs = [budget.run(40, a.work), budget.run(60, b.work)];
    await settle();
    expect(log).toEqual(['a started', 'b started']);
    expect(budget.state()).toEqual({ heldBytes: 100, running: 2, waiting: 0 });
    a.finish();
    b.finish();
    expect(await Promise.all(runs)).toEqual(['a', 'b']);
    expect(budget.state()).toEqual({ heldBytes: 0, running: 0, waiting: 0 });
  });

  it('makes validation of uploads beyond the memory budget wait for its turn', async () => {
    const budget = createValidationBudget(100);
    const log: string[] = [];
    const [a, b] = [gate(log, 'a'), gate(log, 'b')];
    const first = budget.run(60, a.work);
    const second = budget.run(60, b.work);
    await settle();
    expect(log).toEqual(['a started']);
    expect(budget.state()).toEqual({ heldBytes: 60, running: 1, waiting: 1 });
    a.finish();
    await first;
    await settle();
    expect(log).toEqual(['a started', 'b started']);
    b.finish();
    await second;
  });

  it('runs one validation larger than the whole budget alone', async () => {
    const budget = createValidationBudget(100);
    const log: string[] = [];
    const [big, small] = [gate(log, 'big'), gate(log, 'small')];
    const runs = [budget.run(500, big.work), budget.run(1, small.work)];
    await settle();
    expect(log).toEqual(['big started']);
    big.finish();
    await settle();
    expect(log).toEqual(['big started', 'small started']);
    small.finish();
    await Promise.all(runs);
  });

  it('keeps the order asked for: a small validation does not overtake a large one waiting', async () => {
    const budget = createValidationBudget(100);
    const log: string[] = [];
    const [a, large, small] = [gate(log, 'a'), gate(log, 'large'), gate(log, 'small')];
    const runs = [budget.run(50, a.work), budget.run(80, large.work), budget.run(10, small.work)];
    await settle();
    expect(log).toEqual(['a started']);
    a.finish();
    await settle();
    expect(log).toEqual(['a started', 'large started', 'small started']);
    large.finish();
    small.finish();
    await Promise.all(runs);
  });

  it('gives the bytes of a failed validation back and passes its error on', async () => {
    const budget = createValidationBudget(100);
    const log: string[] = [];
    const [a, b] = [gate(log, 'a'), gate(log, 'b')];
    const failing = budget.run(100, a.work);
    const next = budget.run(100, b.work);
    a.finish(new Error('damaged'));
    await expect(failing).rejects.toThrow('damaged');
    await settle();
    expect(log).toEqual(['a started', 'b started']);
    b.finish();
    await next;
    expect(budget.state().heldBytes).toBe(0);
  });

  it('refuses a budget or a charge that is not a whole number of bytes', async () => {
    expect(() => createValidationBudget(0)).toThrow(
      'Expected positive integer for limitBytes but received 0 of type number',
    );
    await expect(createValidationBudget(10).run(1.5, async () => 1)).rejects.toThrow(
      'Expected non-negative integer for bytes but received 1.5 of type number',
    );
  });
});
