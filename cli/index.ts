#!/usr/bin/env node
import { runCli } from './program';

const code = await runCli(process.argv.slice(2), {
  fetch,
  env: process.env,
  stdout: process.stdout,
  stderr: process.stderr,
  interactive: Boolean(process.stdin.isTTY && process.stdout.isTTY),
  // Loaded only when a command asks something, so `vanbay --help` stays fast.
  prompt: {
    input: async (options) => (await import('@inquirer/prompts')).input(options),
    password: async (options) => (await import('@inquirer/prompts')).password({ ...options, mask: '*' }),
    search: async (options) => (await import('@inquirer/prompts')).search(options),
  },
});
process.exitCode = code;
