import { startCli } from './start.js';

process.exitCode = await startCli(process.argv.slice(2));
