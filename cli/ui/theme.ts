/**
 * The one place that knows about colour. Colours are named by meaning; chalk already honours
 * NO_COLOR, FORCE_COLOR and output that is not a terminal.
 */
import chalk from 'chalk';

export const theme = {
  pass: chalk.green,
  warn: chalk.yellow,
  fail: chalk.red,
  muted: chalk.dim,
  strong: chalk.bold,
  error: chalk.red,
};
