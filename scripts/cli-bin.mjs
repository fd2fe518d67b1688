// dist/mixwright.mjs: the command. Loads the bundle with its build-time code cache (cli-load.mjs).
import { URL } from 'node:url';
import { loadBundle } from './cli-load.mjs';

const { exports } = loadBundle(new URL('./', import.meta.url));
process.exitCode = await exports.startCli(process.argv.slice(2));
