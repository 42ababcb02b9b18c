// Tables for summaries. cli-table3 would colour headings and borders by its own terminal
// detection; it is told not to, so that NO_COLOR and --no-color hold for tables too.
import Table from 'cli-table3';
import type { Colour } from './colour.ts';

export function makeTable(head: string[], c: Colour, options: { colAligns?: ('left' | 'right' | 'center')[] } = {}) {
  return new Table({
    head: head.map((h) => c.bold(h)),
    style: { head: [], border: [], 'padding-left': 1, 'padding-right': 1, compact: true },
    ...(options.colAligns ? { colAligns: options.colAligns } : {}),
    wordWrap: true,
  });
}

/** A two-column table of labels and values, without a heading row. */
export function makeFiguresTable() {
  return new Table({ style: { head: [], border: [], 'padding-left': 1, 'padding-right': 1 }, wordWrap: true });
}
