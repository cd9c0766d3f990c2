import type { CaughtMail, CaughtMailSummary } from '@clearbase/contracts';
import { mkdir, readdir, readFile, rename, writeFile } from 'node:fs/promises';
import { join } from 'node:path';

/** The folder under DATA_DIR where the local mail catcher keeps what it caught. */
export function caughtMailFolder(dataDir: string): string {
  return join(dataDir, 'dev-mailbox');
}

/** Writes one caught message as JSON, under a temporary name first so a reader never sees half a file. */
export async function saveCaughtMail(folder: string, mail: CaughtMail): Promise<void> {
  await mkdir(folder, { recursive: true });
  const file = join(folder, `${mail.id}.json`);
  await writeFile(`${file}.tmp`, JSON.stringify(mail));
  await rename(`${file}.tmp`, file);
}

/** Every caught message, newest first; an empty list when nothing was caught yet. */
export async function listCaughtMail(folder: string): Promise<CaughtMailSummary[]> {
  let names: string[];
  try {
    names = (await readdir(folder)).filter((n) => n.endsWith('.json'));
  } catch {
    return [];
  }
  const all = await Promise.all(names.map((n) => readCaughtMail(folder, n.slice(0, -'.json'.length))));
  return all
    .filter((m): m is CaughtMail => m !== null)
    .sort((a, b) => b.receivedAt.localeCompare(a.receivedAt) || b.id.localeCompare(a.id))
    .map(({ id, receivedAt, from, to, subject }) => ({ id, receivedAt, from, to, subject }));
}

/** One caught message, or null when there is none of that id. */
export async function readCaughtMail(folder: string, id: string): Promise<CaughtMail | null> {
  if (!/^[a-z0-9-]+$/.test(id)) return null;
  try {
    return JSON.parse(await readFile(join(folder, `${id}.json`), 'utf8')) as CaughtMail;
  } catch {
    return null;
  }
}
