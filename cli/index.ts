#!/usr/bin/env node
import { terminalPrompter } from './lib/terminal-prompter';
import { runCli } from './program';

const code = await runCli(process.argv.slice(2), {
  fetch,
  env: process.env,
  stdout: process.stdout,
  stderr: process.stderr,
  interactive: Boolean(process.stdin.isTTY && process.stdout.isTTY),
  prompt: terminalPrompter,
});
process.exitCode = code;
