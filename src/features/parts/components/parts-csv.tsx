import { useRef } from 'react';
import { Button } from '@/components/ui/button';
import { Notice } from '@/components/ui/feedback';
import { ApiError } from '@/lib/api-client';
import { useImportParts } from '../api/parts.mutations';

interface RowIssue {
  row: number;
  field: string;
  message: string;
}

const rowIssues = (error: unknown): RowIssue[] =>
  error instanceof ApiError && Array.isArray(error.details) ? (error.details as RowIssue[]).filter((d) => typeof d?.row === 'number') : [];

/** Export the parts as CSV (everyone) and import a CSV (managers): all rows or none. */
export function PartsCsv({ canImport }: { canImport: boolean }) {
  const importParts = useImportParts();
  const input = useRef<HTMLInputElement>(null);
  const issues = rowIssues(importParts.error);

  return (
    <div className="space-y-2">
      <div className="flex flex-wrap items-center gap-2">
        <a href="/api/parts/export.csv" className="rounded-chip bg-white px-3.5 py-2 font-semibold text-ink-800 ring-1 ring-ink-200 hover:bg-ptfe-100" download>
          Export CSV
        </a>
        {canImport ? (
          <>
            <input
              ref={input}
              type="file"
              accept=".csv,text/csv"
              className="sr-only"
              aria-label="CSV file to import"
              onChange={async (e) => {
                const file = e.target.files?.[0];
                e.target.value = '';
                if (file) importParts.mutate(await file.text());
              }}
            />
            <Button variant="secondary" disabled={importParts.isPending} onClick={() => input.current?.click()}>
              {importParts.isPending ? 'Importing…' : 'Import CSV…'}
            </Button>
          </>
        ) : null}
      </div>
      {importParts.isSuccess ? <Notice tone="pass">Imported {importParts.data.imported} parts.</Notice> : null}
      {importParts.error ? (
        <Notice tone="fault">
          <p className="font-semibold">{importParts.error.message}</p>
          {issues.length ? (
            <ul className="mt-1 list-disc pl-5">
              {issues.slice(0, 20).map((i) => (
                <li key={`${i.row}-${i.field}`}>
                  Row {i.row}, {i.field || 'row'}: {i.message}
                </li>
              ))}
              {issues.length > 20 ? <li>…and {issues.length - 20} more</li> : null}
            </ul>
          ) : null}
        </Notice>
      ) : null}
    </div>
  );
}
