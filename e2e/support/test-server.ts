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
  const deadline = Date.now() + 60_000;
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
      throw new Error(`The server did not answer within 60 s:\n${log}`);
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  return {
    url,
    dataDir,
    output: () => log,
    stop: async () => {
      if (child.exitCode === null) {
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
