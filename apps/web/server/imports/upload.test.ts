import { describe, expect, it } from 'vitest';
import { IMPORT_MAX_BYTES } from '~/lib/validators/import-columns';
import { readImportForm } from './upload';

const MB = 1024 * 1024;

/** A multipart body of `fileBytes` bytes sent 1 MB at a time, counting what the reader pulled. */
function upload(fileBytes: number, declareLength = false) {
  const boundary = 'reelwright-test-boundary';
  const head = new TextEncoder().encode(
    `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="jobs.csv"\r\n` +
      'Content-Type: text/csv\r\n\r\n',
  );
  const tail = new TextEncoder().encode(`\r\n--${boundary}--\r\n`);
  const chunk = new Uint8Array(MB).fill(0x61);
  let sent = 0;
  let pulled = 0;
  const body = new ReadableStream<Uint8Array>({
    pull(controller) {
      if (sent === 0) controller.enqueue(head);
      if (sent >= fileBytes) {
        controller.enqueue(tail);
        controller.close();
        return;
      }
      const part = chunk.subarray(0, Math.min(MB, fileBytes - sent));
      sent += part.byteLength;
      pulled += part.byteLength;
      controller.enqueue(part);
    },
  });
  const headers: Record<string, string> = {
    'content-type': `multipart/form-data; boundary=${boundary}`,
  };
  if (declareLength) headers['content-length'] = String(fileBytes + head.length + tail.length);
  const request = new Request('http://127.0.0.1/api/imports/jobs', {
    method: 'POST',
    headers,
    body,
    duplex: 'half',
  } as RequestInit);
  return { request, pulled: () => pulled };
}

describe('import upload', () => {
  it('shop lead – a file within the limit is read whole', async () => {
    const { request } = upload(2 * MB);
    const form = await readImportForm(request);
    expect((form.get('file') as File).size).toBe(2 * MB);
  });

  it('shop lead – a file over the limit is refused with 413 once it passes the limit, unread beyond it', async () => {
    const { request, pulled } = upload(IMPORT_MAX_BYTES + 20 * MB);
    await expect(readImportForm(request)).rejects.toMatchObject({ status: 413, slug: 'too-large' });
    expect(pulled()).toBeLessThan(IMPORT_MAX_BYTES + 4 * MB);
  });

  it('shop lead – a declared length over the limit is refused before any of the body is read', async () => {
    const { request, pulled } = upload(IMPORT_MAX_BYTES + 20 * MB, true);
    await expect(readImportForm(request)).rejects.toMatchObject({ status: 413 });
    // Only what the stream buffers on its own before anyone reads.
    expect(pulled()).toBeLessThanOrEqual(MB);
  });
});
