import { accessSync, constants } from 'node:fs';

/** Where the system Chromium is: CLEARBASE_CHROMIUM, else Debian's /usr/bin/chromium. */
export function chromiumPath(): string {
  const path = process.env['CLEARBASE_CHROMIUM'] ?? '/usr/bin/chromium';
  try {
    accessSync(path, constants.X_OK);
  } catch {
    throw new Error(
      `The browser tests need Chromium at ${path}, and there is none. ` +
        'Install it with `sudo apt-get update && sudo apt-get install -y chromium`, ' +
        'or point CLEARBASE_CHROMIUM at a Chromium executable.',
    );
  }
  return path;
}
