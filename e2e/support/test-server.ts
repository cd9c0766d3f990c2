import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync, rmSync, existsSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

export interface TestServer {
  url: string;
  dataDir: string;
  output: () => string;
  stop: () => Promise<void>;
}

async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = createServer();
    srv.unref();
    srv.on('error', reject);
    srv.listen(0, '127.0.0.1', () => {
      const address = srv.address();
      const port = typeof address === 'object' && address ? address.port : 0;
      srv.close(() => resolve(port));
    });
  });
}

/**
 * Starts the real server (the same entry point as `npm start`) on a free loopback port with a fresh data folder,
 * seeded with the demo lab, and waits until it answers.
 */
export async function startTestServer(env: Record<string, string> = {}): Promise<TestServer> {
  if (!existsSync('dist/web/browser/index.html')) {
    throw new Error('The web app is not built: run `npm run build:web` (npm run test:e2e does it first).');
  }
  const port = await freePort();
  const dataDir = mkdtempSync(join(tmpdir(), 'clearbase-e2e-'));
  let log = '';
  const child: ChildProcess = spawn(process.execPath, ['--import', 'tsx', 'server/src/main.ts'], {
    env: {
      ...process.env,
      NODE_ENV: 'test',
      HOST: '127.0.0.1',
      PORT: String(port),
      DATA_DIR: dataDir,
      PUBLIC_URL: `http://127.0.0.1:${port}`,
      LOG_LEVEL: 'warn',
      ...env,
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  child.stdout?.on('data', (d: Buffer) => (log += d.toString()));
  child.stderr?.on('data', (d: Buffer) => (log += d.toString()));
  const url = `http://127.0.0.1:${port}`;
  // migrating and seeding the demo lab took 72 s with both cores busy (load 16): leave room above that
  const startupMs = 180_000;
  const deadline = Date.now() + startupMs;
  for (;;) {
    if (child.exitCode !== null)
      throw new Error(`The server exited (${child.exitCode}) while starting:\n${log}`);
    try {
      const res = await fetch(`${url}/api/health`);
      if (res.ok) break;
    } catch {
      // not listening yet
    }
    if (Date.now() > deadline) {
      child.kill('SIGKILL');
      throw new Error(`The server did not answer within ${startupMs / 1000} s:\n${log}`);
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  let stopping = false;
  // a server that dies under the tests shows only as refused connections: say why it ended, with its output
  child.once('exit', (code, signal) => {
    if (!stopping)
      console.error(`The test server on ${url} exited (${signal ?? code}) while in use:\n${log}`);
  });
  return {
    url,
    dataDir,
    output: () => log,
    stop: async () => {
      stopping = true;
      // a process ended by a signal keeps exitCode null: only one still running is asked to stop
      if (child.exitCode === null && child.signalCode === null) {
        const exited = new Promise((r) => child.once('exit', r));
        child.kill('SIGTERM');
        const timer = setTimeout(() => child.kill('SIGKILL'), 10_000);
        await exited;
        clearTimeout(timer);
      }
      rmSync(dataDir, { recursive: true, force: true });
    },
  };
}
