import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, renameSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { basename, join, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { buildSync } from 'esbuild';

const ROOT = fileURLToPath(new URL('../../../', import.meta.url));
const ROOT_TSCONFIG = join(ROOT, 'tsconfig.json');
const bundles = new Map<string, URL>();

/** What a bundle was made from: each input file's size and modification time, to tell when it is stale. */
interface BundleManifest {
  bundle: string;
  inputs: Record<string, { size: number; mtimeMs: number }>;
}

/**
 * One plain-JavaScript ES module holding a TypeScript worker entry and everything it imports, so a worker
 * thread starts without a TypeScript loader (which costs seconds and tens of megabytes per thread).
 *
 * Kept under the system's temporary folder with the bundle's SHA-256 in its name, beside a manifest of its
 * input files' sizes and modification times: a later process whose sources are unchanged reuses it without
 * starting esbuild at all (which alone takes a few hundred milliseconds); a changed source rebuilds it.
 * The entry must import only modules that bundle whole (no native addons, nothing resolved at run time).
 *
 * Throws esbuild's error for a source that does not build.
 * @example new Piscina({ filename: bundleWorker(new URL('./invert-chunk.ts', import.meta.url)).href })
 */
export function bundleWorker(entry: URL): URL {
  const known = bundles.get(entry.href);
  if (known) return known;
  const source = fileURLToPath(entry);
  const dir = join(tmpdir(), 'clearbase-workers');
  const name = basename(source).replace(/\.ts$/, '');
  const manifestFile = bundleManifestFile(entry);
  const url = pathToFileURL(reuse(manifestFile) ?? build(source, dir, name, manifestFile));
  bundles.set(entry.href, url);
  return url;
}

/**
 * Where the manifest of an entry's bundle is kept: one per entry path, so checkouts of the same sources in two
 * folders (whose bundles may be byte-identical and share one file) each keep their own list of inputs.
 * @example JSON.parse(readFileSync(bundleManifestFile(entry), 'utf8')).inputs
 */
export function bundleManifestFile(entry: URL): string {
  const source = fileURLToPath(entry);
  const name = basename(source).replace(/\.ts$/, '');
  const key = createHash('sha256').update(source).digest('hex').slice(0, 16);
  return join(tmpdir(), 'clearbase-workers', `${name}-${key}.json`);
}

function reuse(manifestFile: string): string | null {
  try {
    const manifest = JSON.parse(readFileSync(manifestFile, 'utf8')) as BundleManifest;
    if (!existsSync(manifest.bundle)) return null;
    for (const [file, seen] of Object.entries(manifest.inputs)) {
      const now = statSync(file);
      if (now.size !== seen.size || now.mtimeMs !== seen.mtimeMs) return null;
    }
    return manifest.bundle;
  } catch {
    return null;
  }
}

function build(source: string, dir: string, name: string, manifestFile: string): string {
  const result = buildSync({
    entryPoints: [source],
    bundle: true,
    format: 'esm',
    platform: 'node',
    target: 'node20',
    tsconfig: ROOT_TSCONFIG,
    absWorkingDir: ROOT,
    metafile: true,
    write: false,
    logLevel: 'silent',
  });
  const code = result.outputFiles[0]!.contents;
  const bundle = join(dir, `${name}-${createHash('sha256').update(code).digest('hex').slice(0, 16)}.mjs`);
  const inputs: BundleManifest['inputs'] = {};
  for (const input of Object.keys(result.metafile.inputs)) {
    const file = resolve(ROOT, input);
    const { size, mtimeMs } = statSync(file);
    inputs[file] = { size, mtimeMs };
  }
  mkdirSync(dir, { recursive: true });
  // Written under temporary names and renamed, so a concurrent process sees each file whole or not at all.
  atomicWrite(bundle, code);
  atomicWrite(manifestFile, JSON.stringify({ bundle, inputs } satisfies BundleManifest));
  return bundle;
}

function atomicWrite(file: string, contents: string | Uint8Array): void {
  const tmp = `${file}.${process.pid}.tmp`;
  writeFileSync(tmp, contents);
  renameSync(tmp, file);
}
