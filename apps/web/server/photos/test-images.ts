// Tiny but complete image files, encoded here so tests need no binary fixtures or image library.
import { crc32, deflateSync } from 'node:zlib';

function pngChunk(type: string, data: Buffer): Buffer {
  const length = Buffer.alloc(4);
  length.writeUInt32BE(data.length);
  const body = Buffer.concat([Buffer.from(type, 'latin1'), data]);
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(crc32(body));
  return Buffer.concat([length, body, crc]);
}

/** An RGB PNG of the given size with a simple gradient. */
export function pngImage(width = 4, height = 4): Buffer {
  const header = Buffer.alloc(13);
  header.writeUInt32BE(width, 0);
  header.writeUInt32BE(height, 4);
  header[8] = 8; // bit depth
  header[9] = 2; // colour type: RGB
  const rows: number[] = [];
  for (let y = 0; y < height; y += 1) {
    rows.push(0); // filter: none
    for (let x = 0; x < width; x += 1) {
      rows.push((x * 255) / Math.max(1, width - 1), 120, (y * 255) / Math.max(1, height - 1));
    }
  }
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    pngChunk('IHDR', header),
    pngChunk('IDAT', deflateSync(Buffer.from(rows))),
    pngChunk('IEND', Buffer.alloc(0)),
  ]);
}

const segment = (marker: number, body: number[]) => [
  0xff,
  marker,
  (body.length + 2) >> 8,
  (body.length + 2) & 0xff,
  ...body,
];

/**
 * A baseline JPEG of one 8×8 grey block: quantisation all ones, one-code Huffman tables, and a
 * scan of "DC difference 0, end of block". Any decoder shows it as mid-grey.
 */
export function jpegImage(): Buffer {
  const bytes = [
    0xff,
    0xd8, // SOI
    ...segment(0xe0, [0x4a, 0x46, 0x49, 0x46, 0x00, 1, 1, 0, 0, 1, 0, 1, 0, 0]), // JFIF
    ...segment(0xdb, [0x00, ...Array<number>(64).fill(1)]), // DQT
    ...segment(0xc0, [8, 0, 8, 0, 8, 1, 1, 0x11, 0]), // SOF0: 8×8, one component
    ...segment(0xc4, [0x00, 1, ...Array<number>(15).fill(0), 0x00]), // DHT DC: "0" → category 0
    ...segment(0xc4, [0x10, 1, ...Array<number>(15).fill(0), 0x00]), // DHT AC: "0" → EOB
    ...segment(0xda, [1, 1, 0x00, 0, 63, 0]), // SOS
    0x3f, // bits 0 (DC) 0 (EOB), padded with ones
    0xff,
    0xd9, // EOI
  ];
  return Buffer.from(bytes);
}

/** A lossless WebP of one pixel: five single-symbol prefix codes, so the pixel costs no bits. */
export function webpImage(): Buffer {
  const bits: number[] = [];
  const put = (value: number, count: number) => {
    for (let i = 0; i < count; i += 1) bits.push((value >> i) & 1);
  };
  put(0x2f, 8); // signature
  put(0, 14); // width − 1
  put(0, 14); // height − 1
  put(0, 1); // alpha hint
  put(0, 3); // version
  put(0, 1); // no transform
  put(0, 1); // no colour cache
  put(0, 1); // no meta prefix codes
  for (const symbol of [0x40, 0x80, 0xc0, 0xff, 0]) {
    put(1, 1); // simple code
    put(0, 1); // one symbol
    put(1, 1); // 8-bit symbol
    put(symbol, 8);
  }
  const data = Buffer.alloc(Math.ceil(bits.length / 8));
  bits.forEach((bit, i) => {
    data[i >> 3]! |= bit << (i & 7);
  });
  const chunk = Buffer.concat([Buffer.from('VP8L'), u32le(data.length), data]);
  const padded = data.length % 2 ? Buffer.concat([chunk, Buffer.from([0])]) : chunk;
  return Buffer.concat([
    Buffer.from('RIFF'),
    u32le(4 + padded.length),
    Buffer.from('WEBP'),
    padded,
  ]);
}

/** The start of a camera HEIC file: its `ftyp` box with the heic brand (all a type check reads). */
export function heicStart(): Buffer {
  const compatible = ['mif1', 'heic', 'miaf'];
  const box = Buffer.alloc(16 + 4 * compatible.length);
  box.writeUInt32BE(box.length, 0);
  box.write('ftyp', 4, 'latin1');
  box.write('heic', 8, 'latin1'); // major brand; minor version 0 follows
  compatible.forEach((brand, i) => box.write(brand, 16 + 4 * i, 'latin1'));
  return box;
}

function u32le(n: number): Buffer {
  const b = Buffer.alloc(4);
  b.writeUInt32LE(n);
  return b;
}
