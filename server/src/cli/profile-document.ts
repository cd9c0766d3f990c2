import { readFile } from 'node:fs/promises';
import type { ProfileFieldError } from '@clearbase/contracts';

export type DocumentResult<T> = { ok: true; value: T } | { ok: false; errors: string[] };

/** A validator of an untrusted document, e.g. `validateProfileDocument`. */
export type DocumentValidator<T> = (
  json: unknown,
) => { ok: true; value: T } | { ok: false; errors: ProfileFieldError[] };

/**
 * Reads a JSON document and checks it with `validate`. Errors name the file and each field's
 * path, e.g. `p.json: curves.red.points[2].density: density must increase from point to point`.
 */
export async function readDocument<T>(
  path: string,
  validate: DocumentValidator<T>,
): Promise<DocumentResult<T>> {
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
  const result = validate(json);
  if (result.ok) return { ok: true, value: result.value };
  return {
    ok: false,
    errors: result.errors.map((e) => `${path}: ${e.path || '(document)'}: ${e.message}`),
  };
}
