import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

const here = import.meta.dirname;

describe('the plain values entry of the contracts', () => {
  it('imports nothing but its own files, so the browser gets no schema library with it', () => {
    const offending: string[] = [];
    for (const file of readdirSync(here).filter((f) => f.endsWith('.ts') && !f.endsWith('.test.ts'))) {
      const text = readFileSync(join(here, file), 'utf8');
      for (const [, from] of text.matchAll(/from\s+'([^']+)'/g)) {
        if (!from!.startsWith('./')) offending.push(`${file} imports ${from}`);
      }
    }
    expect(offending).toEqual([]);
  });
});
