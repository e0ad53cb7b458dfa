import type { Prompter } from './deps';

/**
 * The questions asked at a real keyboard, with @inquirer/prompts. Loaded only when a command asks
 * something, so `vanbay --help` stays fast.
 */
export const terminalPrompter: Prompter = {
  input: async (options) => (await import('@inquirer/prompts')).input(options),
  password: async (options) => (await import('@inquirer/prompts')).password({ ...options, mask: '*' }),
  search: async (options) => (await import('@inquirer/prompts')).search(options),
};
