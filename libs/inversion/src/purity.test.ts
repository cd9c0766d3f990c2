import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

const here = new URL('.', import.meta.url).pathname;
// Modules the library may import: its own files, culori (pure JS colour maths), quickselect (a pure JS selection)
// and contract types.
const allowed = (spec: string) =>
  spec.startsWith('./') || spec === 'culori' || spec === 'quickselect' || spec === '@clearbase/contracts';

// The tests' shared set-up reads reference tables from disk; no module of the library may import it.
const testFixtures = 'test-fixtures.ts';

describe('inversion library purity', () => {
  it('imports no platform, DOM or I/O modules outside its tests', () => {
    const offenders: string[] = [];
    const shipped = readdirSync(here).filter(
      (f) => f.endsWith('.ts') && !f.endsWith('.test.ts') && f !== testFixtures,
    );
    for (const file of shipped) {
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
  it('keeps the tests’ shared set-up out of the library: no module imports it', () => {
    const importers = readdirSync(here)
      .filter((f) => f.endsWith('.ts') && !f.endsWith('.test.ts'))
      .filter((f) => /from\s*['"]\.\/test-fixtures['"]/.test(readFileSync(join(here, f), 'utf8')));
    expect(importers).toEqual([]);
  });
});
