import { useQueryClient } from '@tanstack/react-query';
import Papa from 'papaparse';
import { useRef, useState, type ChangeEvent } from 'react';
import { formatCount } from '~/lib/format';
import { importKeys, sendImport, type ImportOutcome } from '~/lib/queries/imports';
import type { ImportRowError } from '~/lib/validators/imports';
import {
  guessMapping,
  IMPORT_FIELDS,
  IMPORT_MAX_BYTES,
  IMPORT_MAX_ROWS,
  type ImportField,
} from '~/lib/import-columns';
import type { ImportProgress } from '~/server/imports/jobs';

export interface FileRead {
  file: File;
  headers: string[];
  rows: Record<string, string>[];
}

export type Mapping = Partial<Record<ImportField, string>>;

export type Phase =
  | { kind: 'idle' }
  | { kind: 'reading'; fraction: number; rows: number }
  | { kind: 'read-failed'; message: string }
  | { kind: 'checking'; done: number; total: number }
  | { kind: 'checked'; errors: ImportRowError[]; rowCount: number }
  | { kind: 'sending'; fraction: number }
  | { kind: 'storing'; progress: ImportProgress }
  | { kind: 'finished'; outcome: Exclude<ImportOutcome, { kind: 'rejected' }> };

const SLICE = 2_000;
const nextFrame = () => new Promise((resolve) => setTimeout(resolve, 0));

/** Reading the file in the browser, checking its rows in slices, then sending it. */
export function useCsvImport(timeZone: string) {
  const queryClient = useQueryClient();
  const [read, setRead] = useState<FileRead | null>(null);
  const [mapping, setMapping] = useState<Mapping>({});
  const [phase, setPhase] = useState<Phase>({ kind: 'idle' });
  const resultRef = useRef<HTMLDivElement>(null);
  // The matching stays folded away when the headings already name every needed field.
  const [showMapping, setShowMapping] = useState(false);

  const busy = ['reading', 'checking', 'sending', 'storing'].includes(phase.kind);
  const missingRequired = IMPORT_FIELDS.filter((f) => f.required && !mapping[f.key]);
  const matchedCount = IMPORT_FIELDS.filter((f) => mapping[f.key]).length;

  const focusResult = () => setTimeout(() => resultRef.current?.focus(), 0);

  const onFile = (event: ChangeEvent<HTMLInputElement>) => {
    const file = event.target.files?.[0];
    setRead(null);
    if (!file) return setPhase({ kind: 'idle' });
    if (file.size > IMPORT_MAX_BYTES) {
      return setPhase({
        kind: 'read-failed',
        message: `${file.name} is larger than 50 MB. Split it into smaller files.`,
      });
    }
    const rows: Record<string, string>[] = [];
    let headers: string[] = [];
    setPhase({ kind: 'reading', fraction: 0, rows: 0 });
    Papa.parse<Record<string, string>>(file, {
      header: true,
      skipEmptyLines: 'greedy',
      transformHeader: (h) => h.trim(),
      chunkSize: 512 * 1024,
      chunk: (results) => {
        headers = results.meta.fields ?? headers;
        for (const r of results.data) rows.push(r);
        setPhase({
          kind: 'reading',
          fraction: Math.min(1, results.meta.cursor / file.size),
          rows: rows.length,
        });
      },
      complete: () => {
        if (rows.length === 0) {
          return setPhase({
            kind: 'read-failed',
            message: `${file.name} has no rows under its headings.`,
          });
        }
        if (rows.length > IMPORT_MAX_ROWS) {
          return setPhase({
            kind: 'read-failed',
            message: `${file.name} has ${formatCount(rows.length)} rows; import at most ${formatCount(IMPORT_MAX_ROWS)} at a time.`,
          });
        }
        const guessed = guessMapping(headers);
        setRead({ file, headers, rows });
        setMapping(guessed);
        setShowMapping(IMPORT_FIELDS.some((f) => f.required && !guessed[f.key]));
        setPhase({ kind: 'idle' });
      },
      error: (error) =>
        setPhase({ kind: 'read-failed', message: `The file could not be read: ${error.message}` }),
    });
  };

  /** Matches a field to a column (or to none); a finished check no longer holds. */
  const matchColumn = (field: ImportField, header: string) => {
    setMapping((m) => {
      const next = { ...m };
      if (header) next[field] = header;
      else delete next[field];
      return next;
    });
    if (phase.kind === 'checked') setPhase({ kind: 'idle' });
  };

  const check = async () => {
    if (!read) return;
    const total = read.rows.length;
    const errors: ImportRowError[] = [];
    const seenRefs = new Map<string, number>();
    const now = new Date();
    // The row checks (and zod with them) load when a file is checked, not with the page.
    const { rowShapeErrors, validateImportRows } = await import('~/lib/validators/imports');
    // In slices, so the page stays responsive and shows progress on a 50,000-row file.
    for (let start = 0; start < total; start += SLICE) {
      setPhase({ kind: 'checking', done: start, total });
      await nextFrame();
      const slice = read.rows.slice(start, start + SLICE).map((record) => {
        const row: Mapping = {};
        for (const [field, header] of Object.entries(mapping) as [ImportField, string][]) {
          row[field] = record[header] ?? '';
        }
        return row;
      });
      const result = validateImportRows(slice, {
        timeZone,
        now,
        mapping,
        rowOffset: start,
        seenRefs,
      });
      errors.push(
        ...result.errors,
        ...rowShapeErrors(read.rows.slice(start, start + SLICE), read.headers, start),
      );
    }
    errors.sort((a, b) => a.row - b.row);
    setPhase({ kind: 'checked', errors, rowCount: total });
    focusResult();
  };

  const send = async () => {
    if (!read) return;
    setPhase({ kind: 'sending', fraction: 0 });
    const outcome = await sendImport(read.file, mapping, {
      onUpload: (fraction) => setPhase({ kind: 'sending', fraction }),
      onStored: (progress) => setPhase({ kind: 'storing', progress }),
    });
    setPhase(
      outcome.kind === 'rejected'
        ? { kind: 'checked', errors: outcome.errors, rowCount: outcome.rowCount }
        : { kind: 'finished', outcome },
    );
    await queryClient.invalidateQueries({ queryKey: importKeys.history });
    if (outcome.kind === 'imported') await queryClient.invalidateQueries({ queryKey: ['jobs'] });
    focusResult();
  };

  const reset = () => {
    setRead(null);
    setMapping({});
    setPhase({ kind: 'idle' });
  };

  return {
    read,
    mapping,
    phase,
    busy,
    missingRequired,
    matchedCount,
    showMapping,
    setShowMapping,
    resultRef,
    onFile,
    matchColumn,
    check,
    send,
    reset,
  };
}

export type CsvImport = ReturnType<typeof useCsvImport>;
