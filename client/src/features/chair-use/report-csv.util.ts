import type { ReportDefinitionKey } from '@ostium/shared';
import Papa from 'papaparse';

export interface ReportColumn {
  label: string;
  /** Numbers are right-aligned; a level column shows the difficulty badge. */
  kind?: 'text' | 'number' | 'level';
  /** The figure's definition, shown on hover over the header. */
  definition?: ReportDefinitionKey;
}

/**
 * A report table as the screen shows it: every cell already formatted. The table, its CSV and the
 * printed summary all read this one model, so a download can never disagree with the screen.
 */
export interface ReportTableModel {
  /** The file name's stem ("chair-use-by-chair"). */
  name: string;
  /** The table's accessible name and heading. */
  title: string;
  columns: ReportColumn[];
  rows: string[][];
  /** A totals row, shown in the table's foot and written last in the file (left out when there are no rows). */
  totals?: string[];
}

/** The table as CSV (RFC 4180 via papaparse: quoted where needed, CRLF line ends), header row in words. */
export function tableCsv(model: ReportTableModel): string {
  return Papa.unparse({ fields: model.columns.map((c) => c.label), data: model.totals && model.rows.length > 0 ? [...model.rows, model.totals] : model.rows }, { newline: '\r\n' });
}

export const csvFileName = (model: ReportTableModel, rangePart: string) => `${model.name}_${rangePart}.csv`;

/**
 * Saves text as a file through a temporary link. The byte-order mark lets spreadsheet programs read the
 * file as UTF-8 (the dashes and names in it); common practice, no source.
 */
export function downloadCsv(fileName: string, csv: string) {
  const blob = new Blob(['\ufeff', csv], { type: 'text/csv;charset=utf-8' });
  const href = URL.createObjectURL(blob);
  const a = document.createElement('a');
  a.href = href;
  a.download = fileName;
  a.style.display = 'none';
  document.body.appendChild(a);
  a.click();
  a.remove();
  // Some browsers read the blob after the click returns; let go of it a moment later.
  setTimeout(() => URL.revokeObjectURL(href), 1000);
}
