/** What a `ValidationBudget` holds and owes at a moment, for logs and tests. */
export interface ValidationBudgetState {
  /** Bytes held by the validations running now. */
  heldBytes: number;
  running: number;
  /** Validations waiting for their turn. */
  waiting: number;
}

/** Runs upload validations so that the memory they may hold together stays within a number of bytes. */
export interface ValidationBudget {
  /**
   * Runs `work` once `bytes` fit beside what the running validations hold, in the order asked for (a large one is
   * not overtaken by small ones behind it); one larger than the whole budget runs alone. Resolves or rejects as
   * `work` does and gives its bytes back either way.
   */
  run<T>(bytes: number, work: () => Promise<T>): Promise<T>;
  state(): ValidationBudgetState;
}

/**
 * A memory budget for upload validation: a weighted semaphore over bytes, first come first served. Our own few lines,
 * since p-queue bounds how many tasks run, not how much they weigh.
 *
 * Throws a RangeError when `limitBytes` is not a positive integer; `run` throws one for negative or fractional bytes.
 *
 * @example
 * const budget = createValidationBudget(1024 ** 3);
 * const result = await budget.run(width * height * 6, () => sampleNegative(path, header, step));
 */
export function createValidationBudget(limitBytes: number): ValidationBudget {
  if (!Number.isSafeInteger(limitBytes) || limitBytes < 1) {
    throw new RangeError(
      `Expected positive integer for limitBytes but received ${limitBytes} of type ${typeof limitBytes}`,
    );
  }
  let heldBytes = 0;
  let running = 0;
  const queue: { bytes: number; start: () => void }[] = [];

  const pump = () => {
    while (queue.length && (running === 0 || heldBytes + queue[0]!.bytes <= limitBytes)) {
      const next = queue.shift()!;
      heldBytes += next.bytes;
      running++;
      next.start();
    }
  };

  return {
    run<T>(bytes: number, work: () => Promise<T>): Promise<T> {
      if (!Number.isSafeInteger(bytes) || bytes < 0) {
        return Promise.reject(
          new RangeError(
            `Expected non-negative integer for bytes but received ${bytes} of type ${typeof bytes}`,
          ),
        );
      }
      return new Promise<T>((resolve, reject) => {
        queue.push({
          bytes,
          start: () => {
            // The bytes go back before the caller hears, so what it sees next is the budget without them.
            Promise.resolve()
              .then(work)
              .finally(() => {
                heldBytes -= bytes;
                running--;
                pump();
              })
              .then(resolve, reject);
          },
        });
        pump();
      });
    },
    state: () => ({ heldBytes, running, waiting: queue.length }),
  };
}
