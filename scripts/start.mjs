#!/usr/bin/env node
// npm start: builds the web app when its build is missing or older than its sources, then runs the server.
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, readdirSync, statSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const webSources = [join(root, 'apps/web'), join(root, 'libs'), join(root, 'angular.json')];
const builtIndex = join(root, 'dist/web/browser/index.html');

/** Newest modification time under a file or folder, skipping dependencies and build output. */
function newestMtime(path) {
  if (!existsSync(path)) return 0;
  const stat = statSync(path);
  if (!stat.isDirectory()) return stat.mtimeMs;
  let newest = stat.mtimeMs;
  for (const entry of readdirSync(path)) {
    if (entry === 'node_modules' || entry === 'dist' || entry.startsWith('.')) continue;
    newest = Math.max(newest, newestMtime(join(path, entry)));
  }
  return newest;
}

function buildWebIfNeeded() {
  if (!existsSync(join(root, 'apps/web')) || !existsSync(join(root, 'angular.json'))) {
    console.log('No web app in apps/web yet: serving the API only.');
    return;
  }
  if (process.env.SKIP_WEB_BUILD === 'true') {
    console.log('SKIP_WEB_BUILD=true: not building the web app.');
    return;
  }
  const builtAt = existsSync(builtIndex) ? statSync(builtIndex).mtimeMs : 0;
  const changedAt = Math.max(...webSources.map(newestMtime));
  if (builtAt && builtAt >= changedAt) {
    console.log('The web app build is up to date.');
    return;
  }
  console.log(builtAt ? 'Web app sources changed: rebuilding…' : 'Building the web app (first start)…');
  const result = spawnSync('npx', ['ng', 'build', 'web'], { cwd: root, stdio: 'inherit' });
  if (result.status !== 0) {
    console.error('The web app did not build; fix the errors above, or start with SKIP_WEB_BUILD=true.');
    process.exit(result.status ?? 1);
  }
}

buildWebIfNeeded();

const server = spawn(process.execPath, ['--import', 'tsx', join(root, 'server/src/main.ts')], {
  cwd: root,
  stdio: 'inherit',
  env: process.env,
});
for (const signal of ['SIGINT', 'SIGTERM']) {
  process.on(signal, () => server.kill(signal));
}
server.on('exit', (code, signal) => process.exit(code ?? (signal ? 1 : 0)));
