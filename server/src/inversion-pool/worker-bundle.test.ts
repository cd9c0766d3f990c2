import { execFile } from 'node:child_process';
import { readFile } from 'node:fs/promises';
import { fileURLToPath } from 'node:url';
import { promisify } from 'node:util';
import { describe, expect, it } from 'vitest';
import { bundleManifestFile, bundleWorker } from './worker-bundle';

describe('worker bundle', () => {
  const entry = new URL('./invert-chunk.ts', import.meta.url);

  it('makes one plain-JavaScript module that plain node loads without a TypeScript loader', async () => {
    const bundle = bundleWorker(entry);
    expect(bundle.pathname).toMatch(/invert-chunk-[0-9a-f]{16}\.mjs$/);
    expect(await readFile(bundle, 'utf8')).not.toMatch(/from ['"]@clearbase\//);
    const { stdout } = await promisify(execFile)(process.execPath, [
      '--input-type=module',
      '-e',
      `const m = await import(${JSON.stringify(bundle.href)}); console.log(typeof m.default);`,
    ]);
    expect(stdout.trim()).toBe('function');
  });

  it('hands out the same bundle again within a process', () => {
    expect(bundleWorker(entry).href).toBe(bundleWorker(entry).href);
  });

  it('records every source it was made from, which is how a changed source is noticed', async () => {
    const bundle = fileURLToPath(bundleWorker(entry));
    const manifest = JSON.parse(await readFile(bundleManifestFile(entry), 'utf8')) as Manifest;
    expect(manifest.bundle).toBe(bundle);
    const inputs = Object.keys(manifest.inputs);
    expect(inputs).toContain(fileURLToPath(entry));
    expect(inputs.some((f) => f.endsWith('libs/inversion/src/compile-inversion.ts'))).toBe(true);
  });
});

interface Manifest {
  bundle: string;
  inputs: Record<string, unknown>;
}
