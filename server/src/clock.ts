/** Where the server gets the time, so tests can set it. */
export interface Clock {
  now(): Date;
}

export const systemClock: Clock = { now: () => new Date() };
