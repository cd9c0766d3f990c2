// sixths of a stop as the trade writes them: halves and thirds where they fall, common practice, from memory
const sixthsAsFraction = ['', '1/6', '1/3', '1/2', '2/3', '5/6'] as const;

/**
 * A shift in stops written as an operator reads it, to the nearest sixth: a sign, whole stops and a fraction, and
 * "stop" or "stops" after it. Zero has no sign.
 * @example stopsLabel(1 / 3) // '+1/3 stop'
 * @example stopsLabel(-1.5) // '−1 1/2 stops'
 * @example stopsLabel(0) // '0 stops'
 */
export function stopsLabel(stops: number): string {
  const sixths = Math.round(stops * 6);
  if (sixths === 0) return '0 stops';
  const size = Math.abs(sixths);
  const whole = Math.floor(size / 6);
  const fraction = sixthsAsFraction[size % 6]!;
  const amount = [whole ? String(whole) : '', fraction].filter(Boolean).join(' ');
  // the minus sign, not a hyphen, as in the rest of the screen
  return `${sixths > 0 ? '+' : '−'}${amount} ${size <= 6 ? 'stop' : 'stops'}`;
}
