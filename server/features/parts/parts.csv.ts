import { parse } from 'csv-parse/sync';
import { stringify } from 'csv-stringify/sync';
import { partInputSchema, type PartValues } from '../../../shared/schemas/parts.js';
import { AppError } from '../../lib/errors.js';

/** The CSV columns, in order: the API's own field names, so a file and a JSON body say the same thing. */
export const csvColumns = [
  'tag', 'kind', 'description', 'connectorA', 'genderA', 'connectorB', 'genderB', 'status', 'lengthMm', 'dielectric', 'velocityFactor',
  'lossDbPerM', 'lossRefHz', 'measuredDelayPs', 'measuredOn', 'measuredHow', 'lossDb', 'delayPs', 'maxInputDbm',
  'minFrequencyHz', 'maxFrequencyHz', 'notes',
] as const satisfies readonly (keyof PartValues)[];

const numericColumns = new Set<string>([
  'lengthMm', 'velocityFactor', 'lossDbPerM', 'lossRefHz', 'measuredDelayPs', 'lossDb', 'delayPs', 'maxInputDbm', 'minFrequencyHz', 'maxFrequencyHz',
]);

export function partsToCsv(parts: PartValues[]): string {
  return stringify(
    parts.map((p) => csvColumns.map((c) => p[c] ?? '')),
    { header: true, columns: [...csvColumns], record_delimiter: 'windows' },
  );
}

export interface RowIssue {
  row: number;
  field: string;
  message: string;
}

/** One CSV cell as the schema expects it: empty → left out, numeric columns → numbers when they read as one. */
function cellValue(column: string, cell: string): unknown {
  const text = cell.trim();
  if (text === '') return undefined;
  if (numericColumns.has(column)) {
    const n = Number(text);
    return Number.isFinite(n) ? n : text;
  }
  return text;
}

/**
 * Parse and validate a whole parts CSV with the same schema as the API. Returns the rows only when every row
 * is valid; otherwise throws 400 with every problem as {row, field, message}. Row numbers are the file's line
 * numbers as a spreadsheet shows them (the header is row 1).
 */
export function parsePartsCsv(text: string): PartValues[] {
  let records: string[][];
  try {
    records = parse(text.replace(/^\uFEFF/, ''), { skip_empty_lines: true, relax_column_count: false });
  } catch (err) {
    throw new AppError(400, 'invalid_csv', `The file is not valid CSV: ${(err as Error).message}`);
  }
  if (records.length === 0) throw new AppError(400, 'invalid_csv', 'The file is empty: it needs a header row and at least one part.');
  const header = records[0]!.map((h) => h.trim());
  const unknown = header.filter((h) => !(csvColumns as readonly string[]).includes(h));
  const missing = (['tag', 'kind', 'connectorA', 'genderA', 'connectorB', 'genderB'] as const).filter((c) => !header.includes(c));
  if (unknown.length || missing.length) {
    const parts = [unknown.length ? `unknown columns: ${unknown.join(', ')}` : '', missing.length ? `missing columns: ${missing.join(', ')}` : ''].filter(Boolean);
    // Files exported before genders were recorded lack these two columns: say what goes in them.
    const genderHint = missing.some((c) => c === 'genderA' || c === 'genderB') ? ' genderA and genderB give each end’s gender: male (plug) or female (jack).' : '';
    throw new AppError(400, 'invalid_csv', `The header row does not match the parts columns (${parts.join('; ')}).${genderHint} Export the inventory to get a template.`, {
      columns: csvColumns,
    });
  }
  if (records.length === 1) throw new AppError(400, 'invalid_csv', 'The file has a header row but no parts.');

  const issues: RowIssue[] = [];
  const rows: PartValues[] = [];
  const seenTags = new Map<string, number>();
  records.slice(1).forEach((record, index) => {
    const row = index + 2;
    const input = Object.fromEntries(header.map((column, i) => [column, cellValue(column, record[i] ?? '')]).filter(([, v]) => v !== undefined));
    const result = partInputSchema.safeParse(input);
    if (!result.success) {
      for (const issue of result.error.issues) issues.push({ row, field: issue.path.map(String).join('.'), message: issue.message });
      return;
    }
    const first = seenTags.get(result.data.tag);
    if (first !== undefined) issues.push({ row, field: 'tag', message: `Tag ${result.data.tag} is already used in row ${first}` });
    else seenTags.set(result.data.tag, row);
    rows.push(result.data);
  });
  if (issues.length) {
    const badRows = new Set(issues.map((i) => i.row)).size;
    throw new AppError(400, 'validation_failed', `${badRows} ${badRows === 1 ? 'row has' : 'rows have'} problems; nothing was imported.`, issues);
  }
  return rows;
}
