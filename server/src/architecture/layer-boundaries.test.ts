import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import { describe, expect, it } from 'vitest';

const root = join(import.meta.dirname, '../../..');

/** Every TypeScript source file under `dir`, tests left out. */
function sources(dir: string): string[] {
  const found: string[] = [];
  for (const name of readdirSync(dir)) {
    const path = join(dir, name);
    if (name === 'node_modules' || name.startsWith('.')) continue;
    if (statSync(path).isDirectory()) found.push(...sources(path));
    else if (/\.ts$/.test(name) && !/\.(test|spec|e2e)\.ts$/.test(name) && !name.endsWith('.d.ts'))
      found.push(path);
  }
  return found;
}

const importsOf = (text: string) =>
  [...text.matchAll(/(?:import|export)[^'"]*?from\s*['"]([^'"]+)['"]|import\(\s*['"]([^'"]+)['"]\s*\)/g)].map(
    (m) => m[1] ?? m[2]!,
  );

// the inversion kernels: tight loops kept in one piece so the per-pixel work stays inlined (our choice)
const kernels = new Set(['libs/inversion/src/compile-inversion.ts']);
// 450 lines: about what one concept needs; past it a file holds several (our choice)
const maxLines = 450;

describe('layer boundaries', () => {
  const routeFiles = sources(join(root, 'server/src')).filter((f) => f.endsWith('-routes.ts'));

  it('keeps SQL out of route files: no route imports kysely or builds a query', () => {
    const offenders: string[] = [];
    for (const file of routeFiles) {
      const text = readFileSync(file, 'utf8');
      const name = relative(root, file);
      if (importsOf(text).includes('kysely')) offenders.push(`${name} imports kysely`);
      if (/\.(selectFrom|insertInto|updateTable|deleteFrom)\(|\.transaction\(\)/.test(text)) {
        offenders.push(`${name} builds a query or a transaction`);
      }
    }
    expect(offenders).toEqual([]);
  });

  it('never lets one routes file import another', () => {
    const offenders = routeFiles.flatMap((file) =>
      importsOf(readFileSync(file, 'utf8'))
        .filter((spec) => spec.startsWith('.') && spec.endsWith('-routes'))
        .map((spec) => `${relative(root, file)} imports ${spec}`),
    );
    const others = sources(join(root, 'server/src'))
      // the composition: the app and its list of route modules put the routes together
      .filter(
        (f) => !f.endsWith('-routes.ts') && !f.endsWith('api-route-modules.ts') && !f.endsWith('/app.ts'),
      )
      .flatMap((file) =>
        importsOf(readFileSync(file, 'utf8'))
          .filter((spec) => spec.startsWith('.') && spec.endsWith('-routes'))
          .map((spec) => `${relative(root, file)} imports ${spec}`),
      );
    expect([...offenders, ...others]).toEqual([]);
  });

  it(`keeps every source file under ${maxLines} lines, the inversion kernels aside`, () => {
    const offenders = ['server', 'libs', 'apps/web/src', 'bin', 'scripts']
      .flatMap((dir) => sources(join(root, dir)))
      .map((file) => ({ name: relative(root, file), lines: readFileSync(file, 'utf8').split('\n').length }))
      .filter(({ name, lines }) => lines > maxLines && !kernels.has(name))
      .map(({ name, lines }) => `${name}: ${lines} lines`);
    expect(offenders).toEqual([]);
  });
});
