/** A command line that cannot be run as written; `main` prints the message and the usage text, exit code 2. */
export class UsageError extends Error {
  override readonly name = 'UsageError';
}
