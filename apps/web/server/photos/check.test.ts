import { describe, expect, it } from 'vitest';
import { PHOTO_MAX_BYTES } from '~/lib/validators/photos';
import { checkPhoto } from './check';
import { heicStart, jpegImage, pngImage, webpImage } from './test-images';

describe('photo check by the file’s bytes', () => {
  it.each([
    ['JPEG', jpegImage(), 'image/jpeg'],
    ['PNG', pngImage(), 'image/png'],
    ['WebP', webpImage(), 'image/webp'],
    ['HEIC', heicStart(), 'image/heic'],
  ])('accepts a %s photo and records its detected type', async (_name, bytes, type) => {
    expect(await checkPhoto(bytes, bytes.length)).toEqual({ ok: true, contentType: type });
  });

  it('refuses a text file renamed to .png, saying the contents were checked', async () => {
    const text = Buffer.from('Drag washers: 3 carbon, 2 steel. Not a photo at all.\n');
    const result = await checkPhoto(text, text.length);
    expect(result.ok).toBe(false);
    expect(!result.ok && result.reason).toBe(
      'This file is not a JPEG, PNG, WebP or HEIC photo (its contents were checked, not its name).',
    );
  });

  it('refuses another real file type and names what it looks like', async () => {
    const pdf = Buffer.from('%PDF-1.7\n%âãÏÓ\n1 0 obj\n<<>>\nendobj\n', 'latin1');
    const result = await checkPhoto(pdf, pdf.length);
    expect(!result.ok && result.reason).toContain('it looks like application/pdf');
  });

  it('refuses a photo over 10 MB even when its bytes are an image', async () => {
    const result = await checkPhoto(pngImage(), PHOTO_MAX_BYTES + 1);
    expect(result).toEqual({ ok: false, reason: 'The photo is 10.0 MB; the limit is 10 MB.' });
    expect(await checkPhoto(pngImage(), PHOTO_MAX_BYTES)).toMatchObject({ ok: true });
  });

  it('refuses an empty file', async () => {
    expect(await checkPhoto(new Uint8Array(), 0)).toEqual({
      ok: false,
      reason: 'The file is empty.',
    });
  });
});
