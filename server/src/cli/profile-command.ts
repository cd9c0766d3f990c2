import { validateProfileDocument } from '@clearbase/contracts';
import { parseCommandArgs } from './parse-command-args';
import { readDocument } from './profile-document';
import { UsageError } from './usage-error';

/** `clearbase profile validate P.json`: prints each error with its path; exit 1 when invalid. */
export async function profileCommand(args: string[]): Promise<number> {
  const { positionals } = parseCommandArgs(args, {});
  const [action, file, ...extra] = positionals;
  if (action !== 'validate')
    throw new UsageError(action ? `Unknown profile action "${action}".` : 'Missing profile action.');
  if (!file || extra.length) throw new UsageError('profile validate takes exactly one file.');
  const result = await readDocument(file, validateProfileDocument);
  if (!result.ok) {
    for (const line of result.errors) process.stderr.write(`${line}\n`);
    return 1;
  }
  process.stdout.write(
    `${file}: valid stock profile "${result.value.stock.name}" (${result.value.id}) version ${result.value.version}\n`,
  );
  return 0;
}
