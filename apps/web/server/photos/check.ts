import { fileTypeFromBuffer } from 'file-type';
import { imageSize } from 'image-size';
import {
  PHOTO_MAX_BYTES,
  PHOTO_TYPES,
  PHOTO_TYPES_TEXT,
  type PhotoType,
} from '~/lib/validators/photos';

export type PhotoCheck =
  | {
      ok: true;
      contentType: PhotoType;
      width: number;
      height: number;
      /** The image alone, from its first byte to its end marker: what gets stored and served. */
      image: Uint8Array;
    }
  | { ok: false; reason: string };

/** image-size's name for each accepted type. */
const SIZE_TYPES: Record<PhotoType, string> = {
  'image/jpeg': 'jpg',
  'image/png': 'png',
  'image/webp': 'webp',
};

/**
 * Markup a browser could render if it ever took the bytes for a page. A few cameras append data
 * after a JPEG's end (gain maps, motion clips), which is dropped; markup there is an attack.
 */
const MARKUP = /<(?:!doctype|html|head|body|script|iframe|object|embed|svg|style|meta|img)[\s/>]/i;

export const tooLargeReason = (size: number) =>
  `The photo is ${(size / (1024 * 1024)).toFixed(1)} MB; the limit is 10 MB.`;

const notComplete = (type: PhotoType) =>
  `This is not a complete ${type.slice('image/'.length).toUpperCase()} image (its end is missing or damaged); save it again and upload the new file.`;

/**
 * Decides whether an uploaded file is a photo we keep, from all of its bytes: the name and the
 * type the browser claimed are never trusted. The magic must be JPEG, PNG or WebP (file-type), the
 * header must decode to real dimensions (image-size), and the image's own structure must reach its
 * end marker, so a valid header followed by a page is refused.
 */
export async function checkPhoto(bytes: Uint8Array): Promise<PhotoCheck> {
  if (bytes.length === 0) return { ok: false, reason: 'The file is empty.' };
  if (bytes.length > PHOTO_MAX_BYTES) return { ok: false, reason: tooLargeReason(bytes.length) };
  const detected = await fileTypeFromBuffer(bytes);
  const type = PHOTO_TYPES.find((t) => t === detected?.mime);
  if (!type) {
    return {
      ok: false,
      reason: `This file is not a ${PHOTO_TYPES_TEXT} photo (its contents were checked, not its name)${
        detected ? `; it looks like ${detected.mime}` : ''
      }.`,
    };
  }
  let size: ReturnType<typeof imageSize>;
  try {
    size = imageSize(bytes);
  } catch {
    return { ok: false, reason: notComplete(type) };
  }
  if (size.type !== SIZE_TYPES[type] || !(size.width > 0 && size.height > 0)) {
    return { ok: false, reason: notComplete(type) };
  }
  const end = imageEnd(bytes, type);
  if (end === null) return { ok: false, reason: notComplete(type) };
  const trailer = Buffer.from(bytes.buffer, bytes.byteOffset + end, bytes.length - end);
  if (MARKUP.test(trailer.toString('latin1'))) {
    return {
      ok: false,
      reason: 'This file has web-page code after the image, so it was not kept.',
    };
  }
  // EXIF orientations 5–8 turn the picture a quarter: the browser shows it with the sides swapped.
  const turned = size.orientation !== undefined && size.orientation >= 5;
  return {
    ok: true,
    contentType: type,
    width: turned ? size.height : size.width,
    height: turned ? size.width : size.height,
    image: bytes.subarray(0, end),
  };
}

/**
 * Where the image ends (the offset just past its end marker), walking its structure from the
 * start; null when the structure breaks off before the end. No image package reports this.
 */
export function imageEnd(bytes: Uint8Array, type: PhotoType): number | null {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  if (type === 'image/png') {
    // Chunks after the 8-byte signature: length, type, data, CRC; the last one is IEND.
    let at = 8;
    while (at + 12 <= bytes.length) {
      const next = at + 12 + view.getUint32(at);
      if (next > bytes.length) return null;
      if (String.fromCharCode(...bytes.subarray(at + 4, at + 8)) === 'IEND') return next;
      at = next;
    }
    return null;
  }
  if (type === 'image/webp') {
    // One RIFF chunk whose length covers the whole image.
    const end = 8 + view.getUint32(4, true);
    return end <= bytes.length ? end : null;
  }
  return jpegEnd(bytes, view);
}

/** JPEG: marker segments from SOI, entropy-coded data after each SOS, until EOI. */
function jpegEnd(bytes: Uint8Array, view: DataView): number | null {
  let at = 2;
  while (at < bytes.length) {
    if (bytes[at] !== 0xff) return null;
    while (bytes[at] === 0xff) at += 1; // fill bytes
    const marker = bytes[at];
    at += 1;
    if (marker === undefined) return null;
    if (marker === 0xd9) return at; // EOI
    if (marker === 0x01 || (marker >= 0xd0 && marker <= 0xd7)) continue; // no length
    if (at + 2 > bytes.length) return null;
    const length = view.getUint16(at);
    if (length < 2) return null;
    at += length;
    if (marker !== 0xda) continue;
    // Scan data: 0xFF is followed by 0x00 (a stuffed byte) or a restart marker; anything else is
    // the next marker.
    while (at + 1 < bytes.length) {
      const next = bytes[at + 1]!;
      if (bytes[at] === 0xff && next !== 0x00 && !(next >= 0xd0 && next <= 0xd7)) break;
      at += bytes[at] === 0xff ? 2 : 1;
    }
    if (at + 1 >= bytes.length) return null;
  }
  return null;
}
