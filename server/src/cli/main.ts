import { USAGE } from './usage';
import { UsageError } from './usage-error';

type Command = (args: string[]) => Promise<number>;

// Loaded on demand so `clearbase --help` does not start sharp or the worker pool.
const COMMANDS: Record<string, () => Promise<Command>> = {
  invert: async () => (await import('./invert-command')).invertCommand,
  synth: async () => (await import('./synth-command')).synthCommand,
  profile: async () => (await import('./profile-command')).profileCommand,
  calibrate: async () => (await import('./calibrate-command')).calibrateCommand,
};

/**
 * Runs the `clearbase` command line and resolves to its exit status: 0 success, 1 some inputs
 * failed, 2 usage error (the usage text is printed on stderr).
 */
export async function main(argv: string[]): Promise<number> {
  const [name, ...rest] = argv;
  if (name === undefined || name === '--help' || name === '-h' || name === 'help') {
    (name === undefined ? process.stderr : process.stdout).write(USAGE);
    return name === undefined ? 2 : 0;
  }
  const load = COMMANDS[name];
  try {
    if (!load) throw new UsageError(`Unknown command "${name}".`);
    return await (
      await load()
    )(rest);
  } catch (error) {
    if (error instanceof UsageError || isParseArgsError(error)) {
      process.stderr.write(`clearbase: ${(error as Error).message}\n\n${USAGE}`);
      return 2;
    }
    throw error;
  }
}

function isParseArgsError(error: unknown): boolean {
  const code = (error as { code?: unknown } | null)?.code;
  return typeof code === 'string' && code.startsWith('ERR_PARSE_ARGS_');
}
