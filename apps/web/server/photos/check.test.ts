import { imageSize } from 'image-size';
import { describe, expect, it } from 'vitest';
import { PHOTO_MAX_BYTES, photoUploadRequest } from '~/lib/validators/photos';
import { checkPhoto, imageEnd } from './check';
import { heicStart, jpegImage, pngImage, webpImage } from './test-images';

const html = Buffer.from('<html><body><script>fetch("/api/me")</script></body></html>\n');

describe('photo check by the file’s bytes', () => {
  it.each([
    ['JPEG', jpegImage(), 'image/jpeg', 8, 8],
    ['PNG', pngImage(6, 3), 'image/png', 6, 3],
    ['WebP', webpImage(), 'image/webp', 1, 1],
  ])('accepts a %s photo with its detected type and size', async (_name, bytes, type, w, h) => {
    const result = await checkPhoto(bytes);
    expect(result).toEqual({ ok: true, contentType: type, width: w, height: h, image: bytes });
  });

  it('refuses a PNG header followed by a web page', async () => {
    // The signature and IHDR chunk of a real PNG: file-type and image-size alone both pass it.
    const header = pngImage(64, 64).subarray(0, 33);
    const polyglot = Buffer.concat([header, html]);
    expect(imageSize(polyglot)).toMatchObject({ type: 'png', width: 64, height: 64 });
    expect(await checkPhoto(polyglot)).toEqual({
      ok: false,
      reason:
        'This is not a complete PNG image (its end is missing or damaged); save it again and upload the new file.',
    });
  });

  it('refuses a whole PNG with a web page after its end', async () => {
    expect(await checkPhoto(Buffer.concat([pngImage(), html]))).toEqual({
      ok: false,
      reason: 'This file has web-page code after the image, so it was not kept.',
    });
    const svg = Buffer.from('<svg xmlns="http://www.w3.org/2000/svg" onload="alert(1)"/>');
    expect(await checkPhoto(Buffer.concat([jpegImage(), svg]))).toMatchObject({ ok: false });
  });

  it('keeps a JPEG whose camera appended data after its end, without that data', async () => {
    // Gain maps and motion clips follow the main image's end marker; only the image is kept.
    const jpeg = jpegImage();
    const trailer = Buffer.concat([jpegImage(), Buffer.alloc(300, 0x11)]);
    const result = await checkPhoto(Buffer.concat([jpeg, trailer]));
    expect(result).toMatchObject({ ok: true, contentType: 'image/jpeg' });
    expect(result.ok && Buffer.from(result.image)).toEqual(jpeg);
  });

  it.each([
    ['PNG', pngImage(32, 32)],
    ['JPEG', jpegImage()],
    ['WebP', webpImage()],
  ])('refuses a %s cut off before its end', async (name, bytes) => {
    const result = await checkPhoto(bytes.subarray(0, bytes.length - 2));
    expect(result.ok).toBe(false);
    expect(!result.ok && result.reason).toContain(`not a complete ${name.toUpperCase()} image`);
  });

  it('finds a JPEG’s end past stuffed bytes and restart markers in its scan data', () => {
    const jpeg = jpegImage();
    const scanStart = jpeg.length - 3;
    const scan = [0x12, 0xff, 0x00, 0x34, 0xff, 0xd0, 0x56, 0xff, 0xd9];
    const bytes = Buffer.concat([jpeg.subarray(0, scanStart), Buffer.from(scan)]);
    expect(imageEnd(bytes, 'image/jpeg')).toBe(bytes.length);
    expect(imageEnd(Buffer.concat([bytes, html]), 'image/jpeg')).toBe(bytes.length);
  });

  it('refuses an SVG, even one that starts like XML', async () => {
    const svg = Buffer.from(
      '<?xml version="1.0"?><svg xmlns="http://www.w3.org/2000/svg"><script>alert(1)</script></svg>',
    );
    const result = await checkPhoto(svg);
    expect(result.ok).toBe(false);
    expect(!result.ok && result.reason).toMatch(/^This file is not a JPEG, PNG or WebP photo/);
  });

  it('refuses a HEIC file, which most browsers cannot show', async () => {
    const result = await checkPhoto(heicStart());
    expect(!result.ok && result.reason).toBe(
      'This file is not a JPEG, PNG or WebP photo (its contents were checked, not its name); it looks like image/heic.',
    );
  });

  it('refuses a text file renamed to .png, saying the contents were checked', async () => {
    const text = Buffer.from('Drag washers: 3 carbon, 2 steel. Not a photo at all.\n');
    const result = await checkPhoto(text);
    expect(!result.ok && result.reason).toBe(
      'This file is not a JPEG, PNG or WebP photo (its contents were checked, not its name).',
    );
  });

  it('refuses another real file type and names what it looks like', async () => {
    const pdf = Buffer.from('%PDF-1.7\n%âãÏÓ\n1 0 obj\n<<>>\nendobj\n', 'latin1');
    const result = await checkPhoto(pdf);
    expect(!result.ok && result.reason).toContain('it looks like application/pdf');
  });

  it('refuses a photo over 10 MB even when its bytes are an image', async () => {
    const png = pngImage();
    const padded = (size: number) => Buffer.concat([png, Buffer.alloc(size - png.length)]);
    expect(await checkPhoto(padded(PHOTO_MAX_BYTES + 1))).toEqual({
      ok: false,
      reason: 'The photo is 10.0 MB; the limit is 10 MB.',
    });
    expect(await checkPhoto(padded(PHOTO_MAX_BYTES))).toMatchObject({ ok: true, image: png });
  });

  it('refuses an empty file', async () => {
    expect(await checkPhoto(new Uint8Array())).toEqual({ ok: false, reason: 'The file is empty.' });
  });
});

describe('the type declared when an upload starts', () => {
  const start = (contentType: unknown) =>
    photoUploadRequest.safeParse({ stage: 'teardown', contentType, size: 1000 });

  it.each(['image/jpeg', 'image/png', 'image/webp', 'IMAGE/PNG', 'Image/WebP'])(
    'technician – may declare %s',
    (type) => {
      expect(start(type).success).toBe(true);
    },
  );

  it.each([
    'image/svg+xml; charset=utf-8',
    'image/svg+xml',
    'image/',
    'image/png\r\nx-amz-acl: public-read',
    'image/png\n',
    ' image/png',
    'image/png; charset=binary',
    'image/heic',
    'image/jpg',
    'text/html',
    'application/octet-stream',
    '',
    42,
  ])('technician – declaring %j is a field error', (type) => {
    const result = start(type);
    expect(result.success).toBe(false);
    expect(result.error?.issues.map((i) => i.path.join('.'))).toEqual(['contentType']);
  });
});
