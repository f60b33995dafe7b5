// GET, POST /api/imports/jobs – the shop's recent imports; import a CSV of past jobs, all rows in one transaction or none
import { isStorableText } from '~/lib/validators/common';
import { columnMappingSchema, IMPORT_MAX_BYTES } from '~/lib/validators/import-columns';
import { route } from '~/server/api';
import { badRequest, fieldErrorsOf, problemResponse } from '~/server/errors';
import { recentImports } from '~/server/imports/history';
import { runImport, type ImportProgress } from '~/server/imports/jobs';
import { prepareImport } from '~/server/imports/prepare';
import { readImportForm, tooLarge } from '~/server/imports/upload';
import { otherMethods } from '~/server/method-not-allowed';

export const dynamic = 'force-dynamic';
// A 50,000-row file takes a while to store.
export const maxDuration = 300;

export const GET = route({ permission: 'jobs:import' }, async ({ principal }) => ({
  imports: await recentImports(principal),
}));

/**
 * multipart/form-data with `file` (the CSV) and `mapping` (JSON: field → the file's heading).
 * 201 with the summary; 400 listing every bad row and column (nothing imported); 409 when the same
 * file was imported before. With `Accept: application/x-ndjson` the answer streams progress lines
 * `{"progress":{…}}` while rows are stored, then `{"done":{…}}` or `{"error":{…}}`.
 */
const postConfig = {
  permission: 'jobs:import',
  contentTypes: ['multipart/form-data'],
  // The file's own limit plus room for the form's framing and the mapping field.
  maxBodyBytes: IMPORT_MAX_BYTES + 1024 * 1024,
} as const;

export const POST = route(postConfig, async ({ principal, request }) => {
  const form = await readImportForm(request);
  const file = form.get('file');
  if (!(file instanceof File) || file.size === 0) {
    throw badRequest('Choose a CSV file to import.', [{ field: 'file', message: 'No file' }]);
  }
  if (file.size > IMPORT_MAX_BYTES) throw tooLarge();
  if (!isStorableText(file.name)) {
    throw badRequest('The file name cannot be stored; rename the file.', [
      { field: 'file', message: 'The name contains a NUL or a broken character' },
    ]);
  }
  let rawMapping: unknown;
  try {
    rawMapping = JSON.parse(String(form.get('mapping') ?? '{}'));
  } catch {
    throw badRequest('The column mapping must be JSON.', [
      { field: 'mapping', message: 'Not JSON' },
    ]);
  }
  const mapping = columnMappingSchema.safeParse(rawMapping);
  if (!mapping.success) {
    throw badRequest('Some columns are not mapped.', fieldErrorsOf(mapping.error, 'mapping'));
  }

  const prepared = await prepareImport(principal, {
    fileName: file.name || 'import.csv',
    bytes: new Uint8Array(await file.arrayBuffer()),
    mapping: mapping.data,
  });
  if (!prepared.ok) {
    const rowsWithErrors = new Set(prepared.errors.map((e) => e.row)).size;
    return Response.json(
      {
        type: '/problems/invalid-import',
        title: 'The file has problems',
        status: 400,
        detail: `${prepared.errors.length} problem${prepared.errors.length === 1 ? '' : 's'} in ${rowsWithErrors} of ${prepared.rowCount} rows; nothing was imported.`,
        instance: request.nextUrl.pathname,
        batchId: prepared.batchId,
        rowCount: prepared.rowCount,
        errors: prepared.errors.map((e) => ({
          field: e.column ? `row ${e.row}, ${e.column}` : `row ${e.row}`,
          message: e.message,
        })),
        rows: prepared.errors,
      },
      { status: 400, headers: { 'content-type': 'application/problem+json' } },
    );
  }

  if (!request.headers.get('accept')?.includes('application/x-ndjson')) {
    return Response.json(await runImport(principal, prepared), { status: 201 });
  }
  const encoder = new TextEncoder();
  const stream = new ReadableStream<Uint8Array>({
    async start(controller) {
      const send = (line: unknown) =>
        controller.enqueue(encoder.encode(`${JSON.stringify(line)}\n`));
      try {
        // runImport gives the event loop a turn after each step, so each line goes out.
        const summary = await runImport(principal, prepared, (progress: ImportProgress) =>
          send({ progress }),
        );
        send({ done: summary });
      } catch (error) {
        send({ error: await problemResponse(error, request.nextUrl.pathname).json() });
      }
      controller.close();
    },
  });
  return new Response(stream, {
    status: 200,
    headers: {
      'content-type': 'application/x-ndjson',
      // no-transform keeps the server's gzip from holding progress lines back until the end.
      'cache-control': 'no-store, no-transform',
      'x-accel-buffering': 'no',
    },
  });
});

export const { DELETE, PATCH, PUT, OPTIONS } = otherMethods(['GET', 'POST']);
