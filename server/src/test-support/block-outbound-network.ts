import net from 'node:net';

const loopback = new Set(['127.0.0.1', '::1', 'localhost', '::ffff:127.0.0.1']);

/** Makes any socket to a non-loopback host fail at once, so tests can never reach the outside network. */
export function blockOutboundNetwork(): void {
  const original = net.Socket.prototype.connect;
  net.Socket.prototype.connect = function (this: net.Socket, ...args: unknown[]) {
    const first = args[0] as { host?: string; path?: string } | number | string | undefined;
    const host =
      typeof first === 'object' && first !== null
        ? first.host
        : typeof args[1] === 'string'
          ? args[1]
          : undefined;
    const isPipe = typeof first === 'object' && first !== null && typeof first.path === 'string';
    if (!isPipe && host !== undefined && !loopback.has(host)) {
      throw new Error(`Outbound network is blocked in tests (tried ${host})`);
    }
    return (original as (...a: unknown[]) => net.Socket).apply(this, args);
  } as typeof original;
}
