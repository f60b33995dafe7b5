// The matrix's object storage: a map in memory in place of S3. The matrix runs on a fixed clock
// (November 2026 must have ended), which S3 servers refuse as a skewed signature; what storage
// answers is not what the matrix tests, only that a photo's bytes are there to serve.

const objects = new Map<string, { bytes: Uint8Array; contentType: string }>();

export async function headObject(key: string): Promise<{ size: number } | null> {
  const object = objects.get(key);
  return object ? { size: object.bytes.length } : null;
}

export async function readFirstBytes(key: string, count: number): Promise<Uint8Array> {
  return (objects.get(key)?.bytes ?? new Uint8Array()).subarray(0, count);
}

export async function putObject(key: string, bytes: Uint8Array, contentType: string) {
  objects.set(key, { bytes: new Uint8Array(bytes), contentType });
}

export async function openObject(
  key: string,
): Promise<{ body: ReadableStream<Uint8Array>; size: number } | null> {
  const object = objects.get(key);
  if (!object) return null;
  return { body: new Blob([new Uint8Array(object.bytes)]).stream(), size: object.bytes.length };
}

export async function deleteObject(key: string): Promise<void> {
  objects.delete(key);
}
