/**
 * Copies every typed array inside a plan onto a SharedArrayBuffer, once per frame, so that
 * posting the plan to each slice task shares the tables instead of cloning them. Works on any
 * plain-object plan; other values are kept as they are.
 */
export function sharePlan<T>(plan: T): T {
  return shareValue(plan) as T;
}

function shareValue(value: unknown): unknown {
  if (ArrayBuffer.isView(value) && !(value instanceof DataView)) {
    if (value.buffer instanceof SharedArrayBuffer) return value;
    const kind = value.constructor as new (
      buffer: SharedArrayBuffer,
    ) => ArrayBufferView & { set(a: ArrayLike<number>): void };
    const copy = new kind(new SharedArrayBuffer(value.byteLength));
    copy.set(value as unknown as ArrayLike<number>);
    return copy;
  }
  if (Array.isArray(value)) return value.map(shareValue);
  if (value && typeof value === 'object' && Object.getPrototypeOf(value) === Object.prototype) {
    return Object.fromEntries(Object.entries(value).map(([k, v]) => [k, shareValue(v)]));
  }
  return value;
}
