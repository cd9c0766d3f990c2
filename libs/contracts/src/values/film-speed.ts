/** EI 3 to 25600: any speed a colour negative is rated at, common practice of the trade, from memory. */
export const eiRange = { min: 3, max: 25600 } as const;
/** −3 to +3 stops in half stops: the range labs develop C-41 push and pull, common practice, from memory. */
export const pushPullStops = { min: -3, max: 3, step: 0.5 } as const;
/** ISO 6 to 25600 spans the speeds film is sold and rated at: common practice of the trade, from memory. */
export const isoRange = { min: 6, max: 25600 } as const;

/** Every push or pull a roll can be developed at, −3 to +3 stops in half stops. */
export const pushPullChoices: readonly number[] = Array.from(
  { length: (pushPullStops.max - pushPullStops.min) / pushPullStops.step + 1 },
  (_, i) => pushPullStops.min + i * pushPullStops.step,
);
