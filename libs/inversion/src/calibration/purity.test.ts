import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

const here = new URL('.', import.meta.url).pathname;
// Modules calibration may import: the library's own files, ml-matrix (pure JS least squares), culori, contract types.
const allowed = (spec: string) =>
  spec.startsWith('./') ||
  spec.startsWith('../') ||
  spec === 'ml-matrix' ||
  spec === 'culori' ||
  spec === '@clearbase/contracts';

describe('calibration purity', () => {
  it('imports no platform, DOM or I/O modules outside its tests', () => {
    const offenders: string[] = [];
    for (const file of readdirSync(here).filter((f) => f.endsWith('.ts') && !f.endsWith('.test.ts'))) {
      const text = readFileSync(join(here, file), 'utf8');
      for (const m of text.matchAll(
        /(?:import|export)[^'"]*?from\s*['"]([^'"]+)['"]|import\(\s*['"]([^'"]+)['"]\s*\)/g,
      )) {
        const spec = m[1] ?? m[2]!;
        if (!allowed(spec)) offenders.push(`${file}: ${spec}`);
      }
      if (/\b(document|window|fetch|process|require)\s*[.(]/.test(text))
        offenders.push(`${file}: uses a platform global`);
    }
    expect(offenders).toEqual([]);
  });
});
