import { IMPORT_MAX_BYTES } from '~/lib/validators/import-columns';
import { ApiError, badRequest } from '../errors';

// The import's upload is read with a byte count, so a body over the limit is refused as soon as
// it passes it rather than after the whole of it has been held in memory.

/** The multipart envelope around the file: the mapping field, boundaries and part headers. */
const ENVELOPE_BYTES = 1024 * 1024;

export const tooLarge = () =>
  new ApiError(
    413,
    'too-large',
    'File too large',
    'The file is larger than 50 MB; split it into smaller files.',
    [{ field: 'file', message: 'Larger than 50 MB' }],
  );

/** The request's form, read through a counter that stops at the file limit. */
export async function readImportForm(request: Request): Promise<FormData> {
  const limit = IMPORT_MAX_BYTES + ENVELOPE_BYTES;
  const declared = Number(request.headers.get('content-length') ?? NaN);
  if (declared > limit) throw tooLarge();
  if (!request.body) throw badRequest('Send the file as multipart/form-data.');

  let seen = 0;
  let over = false;
  const counted = request.body.pipeThrough(
    new TransformStream<Uint8Array, Uint8Array>({
      transform(chunk, controller) {
        seen += chunk.byteLength;
        if (seen > limit) {
          over = true;
          controller.error(tooLarge());
          return;
        }
        controller.enqueue(chunk);
      },
    }),
  );
  const headers = new Headers({ 'content-type': request.headers.get('content-type') ?? '' });
  try {
    return await new Response(counted, { headers }).formData();
  } catch {
    if (over) throw tooLarge();
    throw badRequest('Send the file as multipart/form-data with the fields file and mapping.');
  }
}
