import type { CliIo } from './io.js';

/** Colours for the terminal report; plain text when piped, with NO_COLOR or --no-color. */
export interface Paint {
  pass(text: string): string;
  warn(text: string): string;
  fail(text: string): string;
  bold(text: string): string;
  dim(text: string): string;
}

const sgr = (open: number, close: number) => (text: string) => `\u001b[${open}m${text}\u001b[${close}m`;
const plain = (text: string) => text;

export function painter(io: CliIo, opts: { color: boolean }): Paint {
  // https://no-color.org: any non-empty NO_COLOR turns colour off.
  const on = opts.color && !io.env.NO_COLOR && io.stdoutIsTTY;
  if (!on) return { pass: plain, warn: plain, fail: plain, bold: plain, dim: plain };
  return { pass: sgr(32, 39), warn: sgr(33, 39), fail: sgr(31, 39), bold: sgr(1, 22), dim: sgr(2, 22) };
}

const ANSI = /\u001b\[[0-9;]*m/g;
const visibleLength = (text: string) => text.replace(ANSI, '').length;

/** Columns padded to their widest cell; `right` names the columns of numbers. */
export function table(header: string[], rows: string[][], right: number[] = []): string {
  const all = [header, ...rows];
  const widths = header.map((_, i) => Math.max(...all.map((row) => visibleLength(row[i] ?? ''))));
  const line = (row: string[]) =>
    row
      .map((cell, i) => {
        const pad = ' '.repeat(widths[i] - visibleLength(cell));
        return right.includes(i) ? pad + cell : cell + pad;
      })
      .join('  ')
      .trimEnd();
  return [line(header), ...rows.map(line)].join('\n');
}

/** `label  value` lines with the labels aligned. */
export function fields(pairs: [string, string][]): string {
  const width = Math.max(...pairs.map(([label]) => label.length));
  return pairs.map(([label, value]) => `${label.padEnd(width)}  ${value}`).join('\n');
}

/** A number for people: no float noise, at most `digits` decimals. */
export function num(value: number | null | undefined, digits = 2): string {
  if (value === null || value === undefined) return '—';
  return String(Number(value.toFixed(digits)));
}

export function money(value: number | null | undefined, currency?: string): string {
  if (value === null || value === undefined) return '—';
  return `${value.toFixed(2)}${currency ? ` ${currency}` : ''}`;
}
