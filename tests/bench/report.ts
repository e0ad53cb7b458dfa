/**
 * The bench's figures: each a median of repeated runs beside the floor it is compared with
 * (measured in the same run, interleaved with it), the ratio, the target and whether it
 * was met. Printed as a table, written as JSON and as a README-ready Markdown table.
 */
import os from 'node:os';

export interface Target {
  /** At most this, in the figure's own unit. */
  max?: number;
  /** At most this many times the floor. */
  maxRatio?: number;
}

export interface Figure {
  key: string;
  label: string;
  unit: 'ms' | 'KB';
  /** Median of the runs (or the one measurement of a size). */
  value: number;
  runs: number;
  samples: number[];
  /** Median CPU time of this process, for work done in it (see run.ts, timed). */
  cpu?: number;
  floor: { label: string; value: number; samples: number[]; cpu?: number } | null;
  target: Target | null;
  /** Anything a reader needs to read the figure right. */
  note?: string;
}

export function median(values: readonly number[]): number {
  if (values.length === 0) throw new RangeError('no samples');
  const sorted = [...values].sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 === 1 ? sorted[mid]! : (sorted[mid - 1]! + sorted[mid]!) / 2;
}

export const ratioOf = (figure: Figure) =>
  figure.floor && figure.floor.value > 0 ? figure.value / figure.floor.value : null;

export function verdictOf(figure: Figure): 'pass' | 'miss' | null {
  if (!figure.target) return null;
  const ratio = ratioOf(figure);
  const overMax = figure.target.max !== undefined && figure.value > figure.target.max;
  const overRatio = figure.target.maxRatio !== undefined && ratio !== null && ratio > figure.target.maxRatio;
  return overMax || overRatio ? 'miss' : 'pass';
}

const amount = (value: number, unit: Figure['unit']) =>
  unit === 'KB'
    ? `${value.toFixed(1)} KB`
    : value >= 100
      ? `${value.toFixed(0)} ms`
      : `${value.toFixed(1)} ms`;

function targetText(figure: Figure): string {
  const t = figure.target;
  if (!t) return '—';
  const parts = [];
  if (t.max !== undefined) parts.push(`≤ ${amount(t.max, figure.unit)}`);
  if (t.maxRatio !== undefined) parts.push(`≤ ${t.maxRatio}× floor`);
  return parts.join(', ');
}

export interface MachineInfo {
  cpu: string;
  cores: number;
  ramGb: number;
  os: string;
  node: string;
  date: string;
  loadAverage: number[];
}

export function machineInfo(): MachineInfo {
  const cpus = os.cpus();
  return {
    cpu: cpus[0]?.model.trim() ?? 'unknown',
    cores: cpus.length,
    ramGb: Math.round(os.totalmem() / 2 ** 30),
    os: `${os.type()} ${os.release()} ${os.arch()}`,
    node: process.version,
    date: new Date().toISOString(),
    loadAverage: os.loadavg().map((n) => Math.round(n * 100) / 100),
  };
}

function rows(figures: readonly Figure[]): string[][] {
  return figures.map((figure) => {
    const ratio = ratioOf(figure);
    const verdict = verdictOf(figure);
    return [
      figure.label,
      amount(figure.value, figure.unit),
      figure.floor ? `${figure.floor.label}: ${amount(figure.floor.value, figure.unit)}` : '—',
      ratio === null ? '—' : `${ratio.toFixed(2)}×`,
      targetText(figure),
      verdict ?? '—',
      figure.runs > 1 ? String(figure.runs) : '1',
      figure.cpu === undefined
        ? '—'
        : `${amount(figure.cpu, 'ms')} / ${figure.floor?.cpu === undefined ? '—' : amount(figure.floor.cpu, 'ms')}`,
    ];
  });
}

const HEADER = [
  'figure',
  'median',
  'floor (median)',
  'ratio',
  'target',
  'result',
  'runs',
  'CPU: figure / floor',
];

export function textTable(figures: readonly Figure[]): string {
  const all = [HEADER, ...rows(figures)];
  const widths = HEADER.map((_, i) => Math.max(...all.map((row) => row[i]!.length)));
  const line = (row: string[]) =>
    row
      .map((cell, i) => cell.padEnd(widths[i]!))
      .join('  ')
      .trimEnd();
  return [line(all[0]!), widths.map((w) => '-'.repeat(w)).join('  '), ...all.slice(1).map(line)].join('\n');
}

export function markdown(figures: readonly Figure[], machine: MachineInfo, scale: string): string {
  const table = [HEADER, ...rows(figures)];
  const md = table.map((row) => `| ${row.map((cell) => cell.replace(/\|/g, '\\|')).join(' | ')} |`);
  md.splice(1, 0, `| ${HEADER.map(() => '---').join(' | ')} |`);
  const notes = figures.filter((f) => f.note).map((f) => `- ${f.label}: ${f.note}`);
  return [
    `Latest \`npm run bench\` (${machine.date.slice(0, 10)}), on ${scale}:`,
    '',
    ...md,
    '',
    `Machine: ${machine.cpu}, ${machine.cores} cores, ${machine.ramGb} GB RAM, ${machine.os}, Node ${machine.node}; ` +
      `load average at start ${machine.loadAverage.join(' / ')}.`,
    '',
    ...notes,
  ].join('\n');
}
