import { createProgram } from './program.js';

const { run } = createProgram({
  stdout: process.stdout,
  stderr: process.stderr,
  isTTY: Boolean(process.stdin.isTTY && process.stdout.isTTY),
});
process.exitCode = await run(process.argv.slice(2));
