#!/usr/bin/env node
import { runCli } from './program';

const code = await runCli(process.argv.slice(2), {
  fetch,
  env: process.env,
  stdout: process.stdout,
  stderr: process.stderr,
});
process.exitCode = code;
