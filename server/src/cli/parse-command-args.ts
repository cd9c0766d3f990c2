import { parseArgs, type ParseArgsConfig } from 'node:util';

/** parseArgs with strict checking and positionals; `main` reports its errors as usage errors (exit 2). */
export function parseCommandArgs<T extends NonNullable<ParseArgsConfig['options']>>(
  args: string[],
  options: T,
) {
  return parseArgs({ args, options, allowPositionals: true, strict: true });
}
