#!/usr/bin/env node
// Entry point of the `clearbase` command: loads the TypeScript sources through tsx, from any folder.
import { register } from 'tsx/esm/api';
import { fileURLToPath } from 'node:url';

register({ tsconfig: fileURLToPath(new URL('../tsconfig.json', import.meta.url)) });
const { main } = await import('../server/src/cli/main.ts');
process.exitCode = await main(process.argv.slice(2));
