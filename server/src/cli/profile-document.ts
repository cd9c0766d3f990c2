import { readFile } from 'node:fs/promises';
import type { z } from 'zod';

export type DocumentResult<T> = { ok: true; value: T } | { ok: false; errors: string[] };

/**
 * Reads a JSON document and checks it against `schema`. Errors name the file and each field's
 * path, e.g. `lab.json: gamma.1: Too small: expected number to be >0`.
 */
export async function readDocument<S extends z.ZodType>(
  path: string,
  schema: S,
): Promise<DocumentResult<z.output<S>>> {
  let text: string;
  try {
    text = await readFile(path, 'utf8');
  } catch {
    return { ok: false, errors: [`${path}: the file cannot be read`] };
  }
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (error) {
    return { ok: false, errors: [`${path}: not valid JSON (${(error as Error).message})`] };
  }
  const parsed = schema.safeParse(json);
  if (parsed.success) return { ok: true, value: parsed.data };
  return {
    ok: false,
    errors: parsed.error.issues.map(
      (issue) => `${path}: ${issue.path.length ? issue.path.join('.') : '(document)'}: ${issue.message}`,
    ),
  };
}
