import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { JobRunner } from '../jobs/job-runner';
import { startTestJobRunner } from '../test-support/start-test-job-runner';
import { closeRollStreams, rollListenerCount } from '../jobs/roll-events';
import { addRollWithScans } from '../orders/order-test-fixtures';
import { addUser, createTestApp, testPassword, type TestApp } from '../test-support/test-app';
import { addTestLab } from '../test-support/test-lab';
import { until } from '../test-support/until';

let t: TestApp;
let server: Server;
let base: string;
let roll: number;
let runner: JobRunner;

/** Signs in over real HTTP and returns the Cookie header to send. */
async function cookieFor(email: string): Promise<string> {
  const jar = new Map<string, string>();
  const keep = (res: Response) => {
    for (const line of res.headers.getSetCookie()) {
      const [pair] = line.split(';');
      const eq = pair!.indexOf('=');
      jar.set(pair!.slice(0, eq), pair!.slice(eq + 1));
    }
  };
  const header = () => [...jar].map(([k, v]) => `${k}=${v}`).join('; ');
  keep(await fetch(`${base}/api/health`));
  const login = await fetch(`${base}/api/auth/login`, {
    method: 'POST',
    headers: {
      'content-type': 'application/json',
      cookie: header(),
      'x-xsrf-token': decodeURIComponent(jar.get('XSRF-TOKEN')!),
    },
    body: JSON.stringify({ email, password: testPassword }),
  });
  expect(login.status).toBe(200);
  keep(login);
  return header();
}

/** Reads SSE events from a stream until `stop` says enough. */
async function readEvents(
  body: ReadableStream<Uint8Array>,
  stop: (events: { event: string; data: unknown }[]) => boolean,
): Promise<{ event: string; data: unknown }[]> {
  const reader = body.getReader();
  const decoder = new TextDecoder();
  const events: { event: string; data: unknown }[] = [];
  let buffer = '';
  while (!stop(events)) {
    const { value, done } = await reader.read();
    if (done) break;
    buffer += decoder.decode(value, { stream: true });
    let end: number;
    while ((end = buffer.indexOf('\n\n')) >= 0) {
      const block = buffer.slice(0, end);
      buffer = buffer.slice(end + 2);
      const event = /^event: (.*)$/m.exec(block)?.[1];
      const data = /^data: (.*)$/m.exec(block)?.[1];
      if (event && data) events.push({ event, data: JSON.parse(data) });
    }
  }
  reader.releaseLock();
  return events;
}

beforeAll(async () => {
  t = await createTestApp();
  const { operator, customerId, stockId } = await addTestLab(t);
  await addUser(t.db, 'customer', 'ines@lab.test');
  ({ roll } = await addRollWithScans(operator, {
    customerId,
    stockId,
    scans: [
      { name: 'a.tif', seed: 1 },
      { name: 'b.tif', seed: 2 },
    ],
  }));
  server = t.app.listen(0, '127.0.0.1');
  await new Promise((r) => server.once('listening', r));
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  runner = await startTestJobRunner(t);
});
afterAll(async () => {
  await runner.stop();
  server.closeAllConnections();
  await new Promise((r) => server.close(r));
  await t.close();
});

describe('a roll’s live events', () => {
  it('streams job progress and each frame’s status over Server-Sent Events until the job is done, and lets go of the roll when the client disconnects', async () => {
    const operatorCookie = await cookieFor('oskar@lab.test');
    const customerCookie = await cookieFor('cass@lab.test');
    const abort = new AbortController();
    const open = (cookie: string) =>
      fetch(`${base}/api/rolls/${roll}/events`, { headers: { cookie }, signal: abort.signal });
    const res = await open(operatorCookie);
    // the customer follows the same job, without the frames the lab has not approved for them
    const theirs = await open(customerCookie);
    expect(res.status).toBe(200);
    expect(theirs.status).toBe(200);
    expect(res.headers.get('content-type')).toBe('text/event-stream; charset=utf-8');
    await until(async () => rollListenerCount(t.db, roll) === 2);

    const headers = { cookie: operatorCookie, 'content-type': 'application/json' };
    const xsrf = /XSRF-TOKEN=([^;]+)/.exec(operatorCookie)![1]!;
    const started = await fetch(`${base}/api/rolls/${roll}/invert`, {
      method: 'POST',
      headers: { ...headers, 'x-xsrf-token': decodeURIComponent(xsrf) },
      body: '{}',
    });
    expect(started.status).toBe(202);

    const done = (seen: { event: string; data: unknown }[]) =>
      seen.some((e) => e.event === 'job' && (e.data as { job: { state: string } }).job.state === 'done');
    const [events, customerEvents] = await Promise.all([
      readEvents(res.body!, done),
      readEvents(theirs.body!, done),
    ]);
    expect(customerEvents.filter((e) => e.event === 'frame')).toEqual([]);
    const jobStates = events
      .filter((e) => e.event === 'job')
      .map((e) => (e.data as { job: { state: string; progress: { done: number } } }).job);
    expect(jobStates[0]!.state).toBe('queued');
    expect(jobStates.at(-1)).toMatchObject({ state: 'done', progress: { done: 2, total: 2 } });
    expect(jobStates.map((j) => j.progress.done)).toContain(1);
    const frameStatuses = events
      .filter((e) => e.event === 'frame')
      .map((e) => (e.data as { status: string }).status);
    expect(frameStatuses.filter((s) => s === 'inverting')).toHaveLength(2);
    expect(frameStatuses.filter((s) => s === 'done')).toHaveLength(2);

    abort.abort();
    await until(async () => rollListenerCount(t.db, roll) === 0);
  });

  it('ends open streams when the server shuts down', async () => {
    const res = await fetch(`${base}/api/rolls/${roll}/events`, {
      headers: { cookie: await cookieFor('cass@lab.test') },
    });
    await until(async () => rollListenerCount(t.db, roll) === 1);
    closeRollStreams(t.db);
    const reader = res.body!.getReader();
    for (;;) if ((await reader.read()).done) break;
    await until(async () => rollListenerCount(t.db, roll) === 0);
  });

  it('answers 404, not a stream, for another customer’s roll', async () => {
    const res = await fetch(`${base}/api/rolls/${roll}/events`, {
      headers: { cookie: await cookieFor('ines@lab.test') },
    });
    expect(res.status).toBe(404);
    expect(res.headers.get('content-type')).toContain('application/problem+json');
  });
});
