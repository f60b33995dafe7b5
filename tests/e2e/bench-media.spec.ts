import { expect, test, type APIRequestContext, type Page } from '@playwright/test';
import { deflateSync } from 'node:zlib';
import { screenshotPath, storageState } from './accounts';
import { expectAccessible } from './axe';
import { monthsBefore, SEED_NOW, weekIn } from './clock';

// Photos (straight to the local S3 fake), the ready-for-pickup e-mail (through the local SMTP
// catcher) and the CSV import of past jobs.

const TABLET = { width: 1024, height: 768 };

async function shoot(page: Page, name: string) {
  await page.screenshot({ path: screenshotPath(`${name}-1280`), fullPage: true });
  await page.setViewportSize(TABLET);
  await page.screenshot({ path: screenshotPath(`${name}-1024`), fullPage: true });
  await page.setViewportSize({ width: 1280, height: 900 });
}

const crcTable = Array.from({ length: 256 }, (_, n) => {
  let c = n;
  for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
  return c >>> 0;
});
const crc32 = (bytes: Buffer) => {
  let c = 0xffffffff;
  for (const b of bytes) c = crcTable[(c ^ b) & 0xff]! ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
};
function chunk(type: string, data: Buffer) {
  const body = Buffer.concat([Buffer.from(type, 'latin1'), data]);
  const out = Buffer.alloc(12 + data.length);
  out.writeUInt32BE(data.length, 0);
  body.copy(out, 4);
  out.writeUInt32BE(crc32(body), 8 + data.length);
  return out;
}
/** A real 96×72 PNG: a sea-green to brass gradient with a reel-ish ring. */
function pngImage(width = 96, height = 72): Buffer {
  const header = Buffer.alloc(13);
  header.writeUInt32BE(width, 0);
  header.writeUInt32BE(height, 4);
  header[8] = 8;
  header[9] = 2;
  const raw: number[] = [];
  for (let y = 0; y < height; y++) {
    raw.push(0);
    for (let x = 0; x < width; x++) {
      const d = Math.hypot(x - width / 2, y - height / 2);
      const ring = d > 20 && d < 26;
      raw.push(ring ? 240 : 40 + x, ring ? 220 : 100 + y, ring ? 160 : 90);
    }
  }
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    chunk('IHDR', header),
    chunk('IDAT', deflateSync(Buffer.from(raw))),
    chunk('IEND', Buffer.alloc(0)),
  ]);
}

const inDays = (n: number) =>
  new Date(SEED_NOW.getTime() + n * 86_400_000).toISOString().slice(0, 10);

/** Checks a reel in at the caller's shop through the API and puts it on the bench. */
async function benchJob(request: APIRequestContext, customer: { name: string; email?: string }) {
  const created = await request.post('/api/jobs', {
    data: {
      customer: { ...customer, reminderConsent: false },
      reel: { kind: 'spinning', maker: 'Tidewake', model: 'Seaspin', size: '4000' },
      serviceType: 'tune_up',
      promisedOn: inDays(7),
    },
  });
  expect(created.status()).toBe(201);
  const { id } = (await created.json()) as { id: number };
  const moved = await request.post(`/api/jobs/${id}/transitions`, { data: { to: 'on_bench' } });
  expect(moved.status()).toBe(200);
  return id;
}

test.describe('photos on the bench', () => {
  test.use({ storageState: storageState('techMarram') });

  test('technician – uploads a photo that shows as a thumbnail', async ({ page, request }) => {
    const jobId = await benchJob(request, { name: 'Photo Testangler' });
    await page.goto(`/bench/jobs/${jobId}`);
    const panel = page.getByRole('region', { name: 'Photos' });
    await expect(panel.getByRole('heading', { name: 'Teardown (0)' })).toBeVisible();
    const input = panel.getByLabel('Take or add photos');
    await expect(input).toHaveAttribute('accept', 'image/*');
    await expect(input).toHaveAttribute('capture', 'environment');

    await panel.getByLabel('Stage').selectOption({ label: 'Teardown' });
    await input.setInputFiles({
      name: 'teardown.png',
      mimeType: 'image/png',
      buffer: pngImage(),
    });
    const thumb = panel.getByRole('button', { name: 'Open teardown photo 1 of 1' });
    await expect(thumb).toBeVisible();
    await expect(panel.getByRole('heading', { name: 'Teardown (1)' })).toBeVisible();
    // The thumbnail is the stored image itself, loaded (lazily, once in view) from storage.
    await thumb.scrollIntoViewIfNeeded();
    const img = thumb.locator('img');
    await expect
      .poll(() => img.evaluate((el: HTMLImageElement) => el.complete && el.naturalWidth))
      .toBe(96);

    const { photos } = (await (await request.get(`/api/jobs/${jobId}/photos`)).json()) as {
      photos: { id: number; stage: string; contentType: string; url: string }[];
    };
    expect(photos).toEqual([
      expect.objectContaining({ stage: 'teardown', contentType: 'image/png' }),
    ]);
    // Served by the app, so nothing stored can run as the app's site.
    const photo = photos[0]!;
    expect(await img.getAttribute('src')).toBe(photo.url);
    const file = await request.get(photo.url);
    expect(file.status()).toBe(200);
    expect(file.headers()).toMatchObject({
      'content-type': 'image/png',
      'x-content-type-options': 'nosniff',
      'content-disposition': `inline; filename="job-${jobId}-teardown-${photo.id}.png"`,
      'content-security-policy': "default-src 'none'; frame-ancestors 'none'; sandbox",
    });
    expect(await file.body()).toEqual(pngImage());

    await expectAccessible(page);
    await panel.screenshot({ path: screenshotPath('bench-photos-1280') });
    await page.setViewportSize(TABLET);
    await panel.screenshot({ path: screenshotPath('bench-photos-1024') });
    await page.setViewportSize({ width: 1280, height: 900 });

    // Opens large from the keyboard, and closes with Escape back onto the thumbnail.
    await thumb.focus();
    await page.keyboard.press('Enter');
    const dialog = page.getByRole('dialog', { name: /Teardown photo/ });
    await expect(dialog).toBeVisible();
    await expect(dialog.getByRole('img', { name: 'Teardown photo of the reel' })).toBeVisible();
    await expectAccessible(page);
    await page.screenshot({ path: screenshotPath('bench-photo-large-1280') });
    await page.setViewportSize(TABLET);
    await page.screenshot({ path: screenshotPath('bench-photo-large-1024') });
    await page.setViewportSize({ width: 1280, height: 900 });
    await page.keyboard.press('Escape');
    await expect(dialog).toBeHidden();
    await expect(thumb).toBeFocused();
  });

  test('technician – a renamed text file is refused', async ({ page, request }) => {
    const jobId = await benchJob(request, { name: 'Renamed Testangler' });
    await page.goto(`/bench/jobs/${jobId}`);
    const panel = page.getByRole('region', { name: 'Photos' });
    await panel.getByLabel('Take or add photos').setInputFiles({
      name: 'reel.png',
      mimeType: 'image/png',
      buffer: Buffer.from('Drag stack: 3 carbon washers, 2 steel.\nNot a picture.\n'),
    });
    await expect(panel.getByRole('alert')).toHaveText(
      /reel\.png was not added\. This file is not a JPEG, PNG or WebP photo \(its contents were checked, not its name\)\./,
    );
    await expect(panel.getByRole('heading', { name: 'At check-in (0)' })).toBeVisible();
    expect(
      ((await (await request.get(`/api/jobs/${jobId}/photos`)).json()) as { photos: unknown[] })
        .photos,
    ).toEqual([]);

    // The same refusal through the API: a 400 problem document naming the file field.
    const ticket = await request.post(`/api/jobs/${jobId}/photos`, {
      data: { stage: 'check_in', contentType: 'image/jpeg', size: 20 },
    });
    expect(ticket.status()).toBe(201);
    const { photoId, uploadUrl, headers } = await ticket.json();
    const put = await request.put(uploadUrl, { data: 'twenty bytes of text', headers });
    expect(put.status()).toBe(200);
    const confirm = await request.post(`/api/jobs/${jobId}/photos`, {
      data: { confirm: photoId },
    });
    expect(confirm.status()).toBe(400);
    expect(await confirm.json()).toMatchObject({
      status: 400,
      errors: [{ field: 'file', message: expect.stringContaining('its contents were checked') }],
    });
    // Confirming again finds nothing: the refused upload was removed.
    const again = await request.post(`/api/jobs/${jobId}/photos`, { data: { confirm: photoId } });
    expect(again.status()).toBe(404);
  });

  test('technician – a re-PUT after confirming, a PNG header followed by a page and an SVG type change nothing served', async ({
    request,
  }) => {
    const jobId = await benchJob(request, { name: 'Replay Testangler' });
    const png = pngImage(40, 30);
    const start = (contentType: string, size: number) =>
      request.post(`/api/jobs/${jobId}/photos`, { data: { stage: 'check_in', contentType, size } });
    const ticket = await (await start('image/png', png.length)).json();
    expect(
      (await request.put(ticket.uploadUrl, { data: png, headers: ticket.headers })).status(),
    ).toBe(200);
    const confirmed = await request.post(`/api/jobs/${jobId}/photos`, {
      data: { confirm: ticket.photoId },
    });
    expect(confirmed.status()).toBe(200);
    const { photo } = (await confirmed.json()) as { photo: { url: string } };

    // The old upload URL still answers inside its five minutes, but only makes an orphan.
    const page = Buffer.from(
      '<html><script>alert(document.domain)</script></html>'.padEnd(png.length),
    );
    expect(
      (await request.put(ticket.uploadUrl, { data: page, headers: ticket.headers })).status(),
    ).toBe(200);
    const served = await request.get(photo.url);
    expect(served.headers()['content-type']).toBe('image/png');
    expect(await served.body()).toEqual(png);

    const polyglot = Buffer.concat([
      png.subarray(0, 33),
      Buffer.from('<html><body>hi</body></html>'),
    ]);
    const second = await (await start('image/png', polyglot.length)).json();
    await request.put(second.uploadUrl, { data: polyglot, headers: second.headers });
    const refused = await request.post(`/api/jobs/${jobId}/photos`, {
      data: { confirm: second.photoId },
    });
    expect(refused.status()).toBe(400);
    expect((await refused.json()).errors).toEqual([
      { field: 'file', message: expect.stringContaining('not a complete PNG image') },
    ]);

    for (const type of ['image/svg+xml; charset=utf-8', 'image/', 'image/png\r\nx-evil: 1']) {
      const bad = await start(type, 100);
      expect(bad.status()).toBe(400);
      expect(bad.headers()['content-type']).toContain('application/problem+json');
      expect((await bad.json()).errors).toEqual([
        { field: 'body.contentType', message: 'Only JPEG, PNG or WebP photos can be uploaded' },
      ]);
    }
    const huge = await request.post(`/api/jobs/${jobId}/photos`, { data: { confirm: 2147483648 } });
    expect(huge.status()).toBe(400);
  });

  test('technician – another shop’s job photos are not found', async ({ browser, request }) => {
    const jobId = await benchJob(request, { name: 'Scoped Testangler' });
    const fennel = await browser.newContext({ storageState: storageState('techFennel') });
    expect((await fennel.request.get(`/api/jobs/${jobId}/photos`)).status()).toBe(404);
    const post = await fennel.request.post(`/api/jobs/${jobId}/photos`, {
      data: { stage: 'teardown', contentType: 'image/png', size: 100 },
    });
    expect(post.status()).toBe(404);
    await fennel.close();
  });
});

test('auditor – sees a sampled job’s photo through the round, served as the bench serves it', async ({
  browser,
}) => {
  // A round of one of Fennel Cove's past weeks for the demo auditor, planned by the owner.
  const owner = await browser.newContext({ storageState: storageState('owner') });
  const { shops } = (await (await owner.request.get('/api/shops')).json()) as {
    shops: { id: number; name: string }[];
  };
  const { users } = (await (await owner.request.get('/api/users')).json()) as {
    users: { id: number; email: string }[];
  };
  const planned = await owner.request.post('/api/audit-rounds', {
    data: {
      shopId: shops.find((s) => s.name === 'Fennel Cove')!.id,
      ...weekIn(monthsBefore(4), 2),
      auditorId: users.find((u) => u.email === 'auditor@saltwick.test')!.id,
    },
  });
  expect(planned.status()).toBe(201);
  const round = (await planned.json()) as { id: number; sampledJobIds: number[] };
  const jobId = round.sampledJobIds[0]!;

  await owner.close();
  // The shop's lead adds a photo to the sampled job.
  const lead = await browser.newContext({ storageState: storageState('leadFennel') });
  const png = pngImage(48, 36);
  const started = await lead.request.post(`/api/jobs/${jobId}/photos`, {
    data: { stage: 'reassembly', contentType: 'image/png', size: png.length },
  });
  expect(started.status()).toBe(201);
  const ticket = await started.json();
  await lead.request.put(ticket.uploadUrl, { data: png, headers: ticket.headers });
  const confirmed = await lead.request.post(`/api/jobs/${jobId}/photos`, {
    data: { confirm: ticket.photoId },
  });
  expect(confirmed.status()).toBe(200);
  await lead.close();

  const auditor = await browser.newContext({ storageState: storageState('auditor') });
  const url = `/api/audit-rounds/${round.id}/samples/${jobId}/photos/${ticket.photoId}`;
  const view = (await (
    await auditor.request.get(`/api/audit-rounds/${round.id}/samples/${jobId}`)
  ).json()) as { job: { photos: { id: number; url: string | null }[] } };
  expect(view.job.photos.find((p) => p.id === ticket.photoId)?.url).toBe(url);
  const file = await auditor.request.get(url);
  expect(file.status()).toBe(200);
  expect(file.headers()).toMatchObject({
    'content-type': 'image/png',
    'x-content-type-options': 'nosniff',
    'content-security-policy': "default-src 'none'; frame-ancestors 'none'; sandbox",
  });
  expect(await file.body()).toEqual(png);
  // The bench's route is not the auditor's.
  expect((await auditor.request.get(`/api/jobs/${jobId}/photos/${ticket.photoId}`)).status()).toBe(
    403,
  );

  const page = await auditor.newPage();
  await page.goto(`/audits/${round.id}/samples/${jobId}`);
  const img = page.locator(`img[src="${url}"]`);
  await img.scrollIntoViewIfNeeded();
  await expect.poll(() => img.evaluate((el: HTMLImageElement) => el.naturalWidth)).toBe(48);
  await auditor.close();
});

test.describe('ready-for-pickup e-mail', () => {
  test('owner – sees the ready e-mail the catcher received', async ({ browser }) => {
    const email = `ready.${Date.now()}@example.test`;
    const tech = await browser.newContext({ storageState: storageState('techMarram') });
    const jobId = await benchJob(tech.request, { name: 'Mailtest Angler', email });
    const ready = await tech.request.post(`/api/jobs/${jobId}/transitions`, {
      data: { to: 'ready', reason: 'Checklist kept on paper for this test reel.' },
    });
    expect(ready.status()).toBe(200);
    await tech.close();

    const owner = await browser.newContext({ storageState: storageState('owner') });
    const page = await owner.newPage();
    await page.goto(`/dev/mail?to=${encodeURIComponent(email)}`);
    await expect(page.getByRole('heading', { level: 1, name: 'Caught e-mail' })).toBeVisible();
    const message = page.getByRole('article', {
      name: 'Your Tidewake Seaspin 4000 is ready for pickup at Marram Point',
    });
    await expect(message).toBeVisible();
    await expect(message).toContainText(email);
    await expect(message).toContainText(`job #${jobId}`);
    await expect(message).toContainText('Opening hours:');
    await expectAccessible(page);
    await shoot(page, 'dev-mail');

    // Only the owner has the page.
    const lead = await browser.newContext({ storageState: storageState('leadMarram') });
    expect((await lead.request.get('/api/dev/mail')).status()).toBe(403);
    await lead.close();
    await owner.close();
  });
});

const HEADINGS = [
  'external_ref',
  'customer_name',
  'customer_phone',
  'customer_email',
  'reminder_consent',
  'reel_kind',
  'reel_maker',
  'reel_model',
  'reel_size',
  'bearing_count',
  'gear_ratio',
  'use_profile',
  'water',
  'service_type',
  'state',
  'checked_in_at',
  'promised_at',
  'parts_wait_from',
  'parts_wait_to',
  'ready_at',
  'collected_at',
  'technician_email',
  'bench_minutes',
  'labour',
  'parts',
  'discount',
  'complaint',
  'findings',
];

const cell = (v: string) => (/[",\n]/.test(v) ? `"${v.replace(/"/g, '""')}"` : v);

/**
 * `count` past Marram Point jobs in the template's layout; `change` edits chosen rows (or returns
 * a raw line to write instead, for a broken row).
 */
function importCsv(
  prefix: string,
  count: number,
  change: (i: number, row: Record<string, string>) => string | void = () => {},
) {
  const lines = [HEADINGS.join(',')];
  const day = 86_400_000;
  const base = Date.UTC(2024, 3, 1, 14, 0);
  const at = (t: number) => new Date(t).toISOString().slice(0, 16).replace('T', ' ');
  for (let i = 0; i < count; i++) {
    const checkedIn = base + (i % 300) * day;
    const collected = i % 10 !== 0;
    const row: Record<string, string> = {
      external_ref: `${prefix}-${i + 1}`,
      customer_name: `Import Angler ${Math.floor(i / 5)}`,
      customer_phone: `555 01${String(Math.floor(i / 5) % 100).padStart(2, '0')}`,
      customer_email: '',
      reminder_consent: i % 2 ? 'yes' : 'no',
      reel_kind: ['spinning', 'baitcasting', 'fly', 'lever-drag'][i % 4]!,
      reel_maker: 'Brinehook',
      reel_model: `Moorlark ${i % 6}`,
      reel_size: '2500',
      bearing_count: '5',
      gear_ratio: '5.2:1',
      use_profile: i % 3 ? 'light' : 'heavy',
      water: i % 2 ? 'salt' : 'fresh',
      service_type: ['tune-up', 'overhaul', 'repair'][i % 3]!,
      state: collected ? 'collected' : 'ready',
      checked_in_at: at(checkedIn),
      promised_at: at(checkedIn + 4 * day),
      parts_wait_from: i % 5 === 0 ? at(checkedIn + day) : '',
      parts_wait_to: i % 5 === 0 ? at(checkedIn + 2 * day) : '',
      ready_at: at(checkedIn + 3 * day),
      collected_at: collected ? at(checkedIn + 5 * day) : '',
      technician_email: i % 2 ? 'tech.marram@saltwick.test' : '',
      bench_minutes: String(40 + (i % 50)),
      labour: '55.00',
      parts: i % 4 ? '18.40' : '0',
      discount: '',
      complaint: 'Drag slips under load',
      findings: 'Washers glazed; replaced',
    };
    const raw = change(i, row);
    lines.push(raw ?? HEADINGS.map((h) => cell(row[h] ?? '')).join(','));
  }
  return Buffer.from(`${lines.join('\n')}\n`);
}

async function marramJobCount(request: APIRequestContext) {
  const response = await request.get('/api/jobs?pageSize=25');
  expect(response.status()).toBe(200);
  return ((await response.json()) as { total: number }).total;
}

test.describe('CSV import', () => {
  test.use({ storageState: storageState('leadMarram') });

  test('shop lead – a bad import changes nothing and lists its errors', async ({
    page,
    request,
  }) => {
    const before = await marramJobCount(request);
    await page.goto('/bench/import');
    await expect(page.getByRole('heading', { level: 1, name: 'Import past jobs' })).toBeVisible();
    await expect(page.getByRole('link', { name: 'Download the CSV template' })).toHaveAttribute(
      'href',
      '/api/imports/jobs/template',
    );
    const template = await request.get('/api/imports/jobs/template');
    expect(template.headers()['content-type']).toContain('text/csv');
    expect((await template.text()).split(/\r?\n/)[0]).toBe(HEADINGS.join(','));

    const prefix = `BAD${Date.now()}`;
    const bad = importCsv(prefix, 40, (i, row) => {
      if (i === 3) row.reel_kind = 'trolling';
      if (i === 7) row.labour = '12,5';
      if (i === 12) row.ready_at = '';
      if (i === 20) row.external_ref = `${prefix}-1`;
      // A comma in the findings, not quoted: one cell too many.
      if (i === 30)
        return HEADINGS.map((h) => (h === 'findings' ? 'Glazed, replaced' : cell(row[h]!))).join(
          ',',
        );
    });
    await page.getByLabel('CSV file of past jobs').setInputFiles({
      name: 'bad-jobs.csv',
      mimeType: 'text/csv',
      buffer: bad,
    });
    await expect(page.getByText('bad-jobs.csv: 40 rows, 28 columns.')).toBeVisible();
    // The headings match the template, so every field is matched already and folded away.
    const matched = page.getByText(
      '28 of 28 fields matched from the file’s headings — every needed one',
    );
    await expect(matched).toBeVisible();
    await matched.click();
    await expect(page.getByRole('combobox', { name: 'Reel kind (required)' })).toHaveValue(
      'reel_kind',
    );
    await page.getByRole('button', { name: 'Check 40 rows' }).click();
    await expect(
      page.getByRole('heading', { name: 'Nothing was imported: 5 problems in 5 of 40 rows' }),
    ).toBeVisible();
    const problems = page.getByRole('table', { name: 'Problems found in the file' });
    await expect(problems.locator('tbody tr')).toHaveText([
      /^5reel_kind“trolling” is not one of/,
      /^9labour“12,5” is not an amount like 45\.00/,
      /^14ready_atA job that is collected needs its ready time/,
      /^22external_refThe same job number as row 2/,
      /^32—Has 29 cells but the headings have 28: look for a stray or missing comma/,
    ]);
    await expect(page.getByRole('button', { name: /^Import/ })).toHaveCount(0);
    await expectAccessible(page);
    await shoot(page, 'bench-import-errors');

    // The server decides the same way and changes nothing.
    const refused = await request.post('/api/imports/jobs', {
      multipart: {
        file: { name: 'bad-jobs.csv', mimeType: 'text/csv', buffer: bad },
        mapping: JSON.stringify(Object.fromEntries(HEADINGS.map((h) => [h, h]))),
      },
    });
    expect(refused.status()).toBe(400);
    const problem = await refused.json();
    expect(problem).toMatchObject({
      title: 'The file has problems',
      detail: '5 problems in 5 of 40 rows; nothing was imported.',
    });
    expect(problem.rows.map((r: { row: number; column: string }) => [r.row, r.column])).toEqual([
      [5, 'reel_kind'],
      [9, 'labour'],
      [14, 'ready_at'],
      [22, 'external_ref'],
      [32, undefined],
    ]);

    // A file that looks right but names someone from another shop: only the server can tell.
    const foreign = importCsv(`${prefix}F`, 30, (i, row) => {
      if (i === 9) row.technician_email = 'tech.fennel@saltwick.test';
    });
    await page.getByRole('button', { name: 'Start again with another file' }).click();
    await page.getByLabel('CSV file of past jobs').setInputFiles({
      name: 'foreign.csv',
      mimeType: 'text/csv',
      buffer: foreign,
    });
    await page.getByRole('button', { name: 'Check 30 rows' }).click();
    await page.getByRole('button', { name: 'Import 30 jobs' }).click();
    await expect(
      page.getByRole('heading', { name: 'Nothing was imported: 1 problem in 1 of 30 rows' }),
    ).toBeVisible();
    await expect(problems.locator('tbody tr')).toHaveText([
      /^11technician_emailNo one at Marram Point signs in as tech\.fennel@saltwick\.test/,
    ]);
    expect(await marramJobCount(request)).toBe(before);
  });

  test('shop lead – imports 5,000 rows', async ({ page, request }) => {
    test.setTimeout(240_000);
    const before = await marramJobCount(request);
    const file = importCsv(`K5${Date.now()}`, 5000);
    await page.goto('/bench/import');
    await page.getByLabel('CSV file of past jobs').setInputFiles({
      name: 'five-thousand.csv',
      mimeType: 'text/csv',
      buffer: file,
    });
    await expect(page.getByText('five-thousand.csv: 5,000 rows, 28 columns.')).toBeVisible();
    await expectAccessible(page);
    await page.getByRole('button', { name: 'Check 5,000 rows' }).click();
    await expect(page.getByText('All 5,000 rows look right.')).toBeVisible({ timeout: 30_000 });
    await shoot(page, 'bench-import-ready');
    const started = Date.now();
    await page.getByRole('button', { name: 'Import 5,000 jobs' }).click();
    await expect(
      page.getByRole('heading', { name: 'Imported 5,000 jobs from five-thousand.csv' }),
    ).toBeVisible({ timeout: 180_000 });
    console.log(
      `5,000-row import through the screen: ${((Date.now() - started) / 1000).toFixed(1)} s`,
    );
    await expect(page.getByRole('table', { name: 'Recent imports at this shop' })).toContainText(
      'Imported: 5,000 jobs',
    );
    await expectAccessible(page);
    await shoot(page, 'bench-import-done');
    expect(await marramJobCount(request)).toBe(before + 5000);
  });

  test('shop lead – the same file twice is refused', async ({ page, request }) => {
    const file = importCsv(`TW${Date.now()}`, 25);
    const first = await request.post('/api/imports/jobs', {
      multipart: {
        file: { name: 'spring.csv', mimeType: 'text/csv', buffer: file },
        mapping: JSON.stringify(Object.fromEntries(HEADINGS.map((h) => [h, h]))),
      },
    });
    expect(first.status()).toBe(201);
    expect(await first.json()).toMatchObject({ imported: 25, fileName: 'spring.csv' });
    const before = await marramJobCount(request);

    await page.goto('/bench/import');
    await page.getByLabel('CSV file of past jobs').setInputFiles({
      name: 'spring-again.csv',
      mimeType: 'text/csv',
      buffer: file,
    });
    await page.getByRole('button', { name: 'Check 25 rows' }).click();
    await page.getByRole('button', { name: 'Import 25 jobs' }).click();
    const alert = page.getByRole('alert').filter({ hasText: 'Already imported' });
    await expect(alert).toContainText(
      /This file was already imported on \d{4}-\d{2}-\d{2} by .+ \(import #\d+, “spring\.csv”, 25 jobs\)\. Nothing was imported again from “spring-again\.csv”\./,
    );
    expect(await marramJobCount(request)).toBe(before);
  });

  test('technician – cannot import', async ({ browser }) => {
    const tech = await browser.newContext({ storageState: storageState('techMarram') });
    const response = await tech.request.post('/api/imports/jobs', {
      multipart: {
        file: { name: 'x.csv', mimeType: 'text/csv', buffer: importCsv('NO', 1) },
        mapping: '{}',
      },
    });
    expect(response.status()).toBe(403);
    await tech.close();
  });
});
