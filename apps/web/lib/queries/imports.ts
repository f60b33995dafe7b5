import { queryOptions } from '@tanstack/react-query';
import type { ImportHistoryRow } from '~/server/imports/history';
import type { ImportProgress, ImportSummary } from '~/server/imports/jobs';
import { fetchJson } from '../api-client';
import type { ImportRowError } from '../validators/imports';
import type { ImportField } from '../import-columns';

export const importKeys = {
  history: ['imports', 'jobs'] as const,
};

export const importHistoryQuery = () =>
  queryOptions({
    queryKey: importKeys.history,
    queryFn: () => fetchJson<{ imports: ImportHistoryRow[] }>('/api/imports/jobs'),
  });

export type ImportOutcome =
  | { kind: 'imported'; summary: ImportSummary }
  | { kind: 'rejected'; errors: ImportRowError[]; rowCount: number }
  | { kind: 'duplicate'; message: string }
  | { kind: 'failed'; message: string };

/**
 * POSTs the file and its column mapping, reporting the upload and then the server's progress in
 * storing rows (an NDJSON stream: `{progress}` lines, then `{done}` or `{error}`). XHR rather
 * than fetch, because fetch cannot report upload progress.
 */
export function sendImport(
  file: File,
  mapping: Partial<Record<ImportField, string>>,
  on: { onUpload: (fraction: number) => void; onStored: (progress: ImportProgress) => void },
): Promise<ImportOutcome> {
  return new Promise((resolve) => {
    const form = new FormData();
    form.append('file', file);
    form.append('mapping', JSON.stringify(mapping));
    const xhr = new XMLHttpRequest();
    xhr.open('POST', '/api/imports/jobs');
    xhr.setRequestHeader('accept', 'application/x-ndjson');
    xhr.upload.onprogress = (e) => e.lengthComputable && on.onUpload(e.loaded / e.total);
    let seen = 0;
    let final: ImportOutcome | null = null;
    const readLines = () => {
      if (xhr.status !== 200) return;
      const text = xhr.responseText;
      const end = text.lastIndexOf('\n');
      if (end < seen) return;
      for (const line of text.slice(seen, end).split('\n')) {
        if (!line.trim()) continue;
        const message = JSON.parse(line) as {
          progress?: ImportProgress;
          done?: ImportSummary;
          error?: { status?: number; detail?: string; title?: string };
        };
        if (message.progress) on.onStored(message.progress);
        if (message.done) final = { kind: 'imported', summary: message.done };
        if (message.error) final = problemOutcome(message.error.status ?? 500, message.error);
      }
      seen = end + 1;
    };
    xhr.onprogress = readLines;
    xhr.onload = () => {
      if (xhr.status === 200) {
        readLines();
        return resolve(
          final ?? { kind: 'failed', message: 'The server stopped before finishing.' },
        );
      }
      let problem: {
        detail?: string;
        title?: string;
        rows?: ImportRowError[];
        rowCount?: number;
      } = {};
      try {
        problem = JSON.parse(xhr.responseText);
      } catch {
        // not JSON: fall through to the status text
      }
      if (xhr.status === 400 && problem.rows) {
        return resolve({ kind: 'rejected', errors: problem.rows, rowCount: problem.rowCount ?? 0 });
      }
      resolve(problemOutcome(xhr.status, problem));
    };
    xhr.onerror = () =>
      resolve({
        kind: 'failed',
        message: 'The file could not be sent. Check the connection and try again.',
      });
    xhr.send(form);
  });
}

function problemOutcome(
  status: number,
  problem: { detail?: string; title?: string },
): ImportOutcome {
  const message = problem.detail ?? problem.title ?? `The server answered ${status}.`;
  return status === 409 ? { kind: 'duplicate', message } : { kind: 'failed', message };
}
