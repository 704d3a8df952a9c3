/**
 * A CSV file as a header plus numbered rows (csv-parse), with column lookup and numeric parsing
 * that name the line on failure. Shared by the commanded-path, waypoint and tracks readers.
 */
import { readFile } from 'node:fs/promises';
import { resolve } from 'node:path';
import { parse } from 'csv-parse/sync';
import { EchotrailError } from '../errors.ts';

/** A parsed CSV: lower-cased header names and data rows with their 1-based file line. */
export interface CsvTable {
  /** What the table is, for messages ("tracks CSV tracks.csv"). */
  what: string;
  header: string[];
  rows: { line: number; cells: string[] }[];
}

/** Parse CSV text with a header row. Blank lines and lines starting with '#' are skipped. */
export function parseCsvTable(text: string, what: string): CsvTable {
  let records: { record: string[]; info: { lines: number } }[];
  try {
    records = parse(text, {
      bom: true,
      comment: '#',
      skip_empty_lines: true,
      relax_column_count: true,
      trim: true,
      info: true,
    }) as unknown as { record: string[]; info: { lines: number } }[];
  } catch (err) {
    throw new EchotrailError('E_INPUT_ROW', `${what}: not readable as CSV: ${(err as Error).message}`, { cause: err });
  }
  if (records.length === 0) throw new EchotrailError('E_INPUT_EMPTY', `${what} is empty: expected a header row and data rows`);
  const header = records[0].record.map((h) => h.toLowerCase());
  const rows = records.slice(1).map((r) => ({ line: r.info.lines, cells: r.record }));
  if (rows.length === 0) throw new EchotrailError('E_INPUT_EMPTY', `${what} has a header but no data rows`);
  return { what, header, rows };
}

/** Index of the first present column among `names`, or −1. */
export function findColumn(table: CsvTable, ...names: string[]): number {
  for (const n of names) {
    const i = table.header.indexOf(n);
    if (i >= 0) return i;
  }
  return -1;
}

/** Index of a column that must be there. */
export function requireColumn(table: CsvTable, name: string, hint = ''): number {
  const i = table.header.indexOf(name);
  if (i < 0) {
    throw new EchotrailError(
      'E_INPUT_COLUMNS',
      `${table.what}: missing column '${name}' (found: ${table.header.join(', ')})${hint ? `; ${hint}` : ''}`,
    );
  }
  return i;
}

/** A finite number from a cell, or an error naming the line and column. */
export function numberCell(table: CsvTable, row: { line: number; cells: string[] }, col: number): number {
  const raw = row.cells[col];
  const v = raw === undefined || raw === '' ? NaN : Number(raw);
  if (!Number.isFinite(v)) {
    throw new EchotrailError('E_INPUT_ROW', `${table.what} line ${row.line}: column '${table.header[col]}' is '${raw ?? ''}', not a number`);
  }
  return v;
}

/** A number from a cell that may be empty (coasts leave measurement columns empty). */
export function optionalNumberCell(table: CsvTable, row: { line: number; cells: string[] }, col: number): number | undefined {
  if (col < 0) return undefined;
  const raw = row.cells[col];
  if (raw === undefined || raw === '') return undefined;
  return numberCell(table, row, col);
}

/** A whole input file as text; a file that cannot be read is an E_PATH error naming its full path. */
export async function readInputFile(file: string, what: string): Promise<string> {
  try {
    return await readFile(file, 'utf8');
  } catch (err) {
    const e = err as NodeJS.ErrnoException;
    throw new EchotrailError('E_PATH', `cannot read ${what} ${resolve(file)}: ${e.code === 'ENOENT' ? 'no such file' : e.message}`, { cause: err });
  }
}
