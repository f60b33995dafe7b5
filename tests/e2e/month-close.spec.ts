import { expect, test, type APIRequestContext, type Page } from '@playwright/test';
import { createHmac } from 'node:crypto';
import { readFile } from 'node:fs/promises';
import { screenshotPath, storageState } from './accounts';
import { expectAccessible } from './axe';
import { monthLabel, monthRange, monthsBefore } from './clock';

// Last month is over in every demo shop (the seed's "today" is the start of the next one).
const MONTH = monthsBefore(1);
const LABEL = monthLabel(MONTH);
const { from: MONTH_FIRST, to: MONTH_LAST } = monthRange(MONTH);
// The secret tests/e2e/serve.sh gives the server.
const WEBHOOK_SECRET = process.env.STRIPE_WEBHOOK_SECRET ?? 'whsec_reelwright_end_to_end_only';

/** Stripe's documented signature scheme: v1 = HMAC-SHA256 of "timestamp.payload" with the secret. */
function stripeSignature(payload: string, secret: string) {
  const t = Math.floor(Date.now() / 1000);
  const v1 = createHmac('sha256', secret).update(`${t}.${payload}`).digest('hex');
  return `t=${t},v1=${v1}`;
}

async function screenshots(page: Page, name: string) {
  await page.setViewportSize({ width: 1280, height: 900 });
  await page.screenshot({ path: screenshotPath(`${name}-1280`), fullPage: true });
  await page.setViewportSize({ width: 1024, height: 768 });
  await page.screenshot({ path: screenshotPath(`${name}-1024`), fullPage: true });
  await page.screenshot({ path: screenshotPath(`${name}-1024-top`) });
  await page.setViewportSize({ width: 1280, height: 900 });
}

interface MonthJson {
  status: 'open' | 'closed';
  shops: {
    shop: { name: string };
    royaltyCents: number;
    invoice: { status: string; stripeInvoiceId: string | null } | null;
  }[];
}

async function monthJson(request: APIRequestContext): Promise<MonthJson> {
  const response = await request.get(`/api/month-close/${MONTH}`);
  expect(response.status()).toBe(200);
  return (await response.json()) as MonthJson;
}

test.describe(() => {
  test.use({ storageState: storageState('owner') });

  test('owner – closes a month, downloads the CSV, issues invoices and sees a paid one', async ({
    page,
    request,
  }) => {
    // A server reused from an earlier run may hold the month closed already: start from open.
    if ((await monthJson(request)).status === 'closed') {
      const reopened = await request.post(`/api/month-close/${MONTH}/reopen`, {
        data: { reason: 'Reopened by the end-to-end test to close it again.' },
      });
      expect(reopened.status()).toBe(200);
    }
    await page.goto(`/month-close?month=${MONTH}`);
    await expect(page.getByRole('heading', { level: 1, name: 'Month close' })).toBeVisible();
    const money = page.getByRole('region', { name: 'Revenue and royalties per shop' });
    await expect(money.getByRole('row')).toHaveCount(1 + 7 + 1);
    await expect(money.getByRole('rowheader', { name: /Marram Point/ })).toBeVisible();
    await expectAccessible(page);
    await screenshots(page, 'month-close-open');

    await page.getByRole('button', { name: `Close ${LABEL}` }).click();
    await page.getByRole('button', { name: 'Yes, close the month' }).click();
    await expect(page.getByText('Closed', { exact: true })).toBeVisible();
    await expect(page.getByText('No changes since closing.')).toBeVisible();

    const downloading = page.waitForEvent('download');
    await page.getByRole('link', { name: 'Download CSV' }).click();
    const download = await downloading;
    expect(download.suggestedFilename()).toBe(`reelwright-month-close-${MONTH}.csv`);
    const csv = await readFile((await download.path())!, 'utf8');
    const lines = csv.split('\r\n');
    expect(lines.at(-1)).toBe('');
    expect(lines[0]).toMatch(
      /^row_type,month,period_start,period_end,status,as_of,region,shop_id,shop,/,
    );
    expect(lines.slice(1, -1).map((l) => l.split(',')[0])).toEqual([
      ...Array(7).fill('shop'),
      'total',
    ]);
    expect(lines[1]).toContain(`shop,${MONTH},${MONTH_FIRST},${MONTH_LAST},closed,`);

    // The click enqueues the issuing; the page follows the invoices arriving until all are out.
    await page.getByRole('button', { name: 'Issue royalty invoices' }).click();
    await expect(
      page.getByText('Invoices issued: 7 of 7 shops with a royalty due have one.'),
    ).toBeVisible({ timeout: 30_000 });
    await expect(money.getByText('Sent, unpaid')).toHaveCount(7);
    await page.getByRole('button', { name: 'Issue missing invoices' }).click();
    await expect(
      page.getByText('Invoices issued: 7 of 7 shops with a royalty due have one.'),
    ).toBeVisible({ timeout: 30_000 });
    await expect(money.getByText('Sent, unpaid')).toHaveCount(7);

    const marram = (await monthJson(request)).shops.find((s) => s.shop.name === 'Marram Point')!;
    const invoiceId = marram.invoice!.stripeInvoiceId!;
    const payload = JSON.stringify({
      id: `evt_e2e_${Date.now()}`,
      object: 'event',
      type: 'invoice.paid',
      created: Math.floor(Date.now() / 1000),
      data: { object: { id: invoiceId, object: 'invoice', status: 'paid' } },
    });
    const forged = await request.post('/api/webhooks/payments', {
      headers: {
        'content-type': 'application/json',
        'stripe-signature': stripeSignature(payload, 'whsec_forged'),
      },
      data: payload,
    });
    expect(forged.status()).toBe(400);
    const paid = await request.post('/api/webhooks/payments', {
      headers: {
        'content-type': 'application/json',
        'stripe-signature': stripeSignature(payload, WEBHOOK_SECRET),
      },
      data: payload,
    });
    expect(paid.status()).toBe(200);
    // The webhook stores the event; the payment-event job applies it moments later.
    await expect
      .poll(
        async () =>
          (await monthJson(request)).shops.find((s) => s.shop.name === 'Marram Point')!.invoice!
            .status,
        { timeout: 15_000 },
      )
      .toBe('paid');

    await page.reload();
    const marramRow = money.getByRole('row', { name: /Marram Point/ });
    await expect(marramRow.getByText('Paid', { exact: true })).toBeVisible();
    await expect(money.getByText('Sent, unpaid')).toHaveCount(6);
    await expectAccessible(page);
    await screenshots(page, 'month-close-closed');
  });
});

test.describe(() => {
  test.use({ storageState: storageState('managerNorth') });
  test('regional manager – downloads the CSV of the region only', async ({ request, page }) => {
    const response = await request.get(`/api/month-close/${MONTH}.csv`);
    expect(response.status()).toBe(200);
    expect(response.headers()['content-type']).toContain('text/csv');
    const rows = (await response.text()).trimEnd().split('\r\n').slice(1);
    expect(rows).toHaveLength(4 + 1);
    expect(rows.slice(0, 4).every((r) => r.includes(',North Shore,'))).toBe(true);
    expect(rows.at(-1)).toMatch(/^total,.*North Shore \(4\)/);
    expect((await request.post(`/api/month-close/${MONTH}/close`)).status()).toBe(403);
    await page.goto(`/month-close?month=${MONTH}`);
    await expect(page.getByRole('button', { name: /Close|Issue/ })).toHaveCount(0);
  });
});

test.describe(() => {
  test.use({ storageState: storageState('leadMarram') });
  test('shop lead – sends reminders once', async ({ page, request, browser }) => {
    await page.goto('/reminders');
    await expect(page.getByRole('heading', { level: 1, name: 'Service reminders' })).toBeVisible();
    await expectAccessible(page);
    let send = page.getByRole('button', { name: /^Send \d+ reminders?$/ });
    if (!(await send.isVisible())) {
      // A server reused from an earlier run has sent the near ones: look further ahead.
      await page.getByLabel('Due within').selectOption('26');
      send = page.getByRole('button', { name: /^Send \d+ reminders?$/ });
    }
    const total = Number((await send.textContent())!.match(/\d+/)![0]);
    expect(total).toBeGreaterThan(0);
    await screenshots(page, 'reminders-due');
    const weeks = await page.getByLabel('Due within').inputValue();

    await send.click();
    await page.getByRole('button', { name: 'Yes, send' }).click();
    await expect(page.getByRole('heading', { name: 'Reminders sent' })).toBeVisible({
      timeout: 30_000,
    });
    await expect(page.getByRole('progressbar')).toHaveAttribute('aria-valuenow', String(total));
    await expect(page.getByText(`${total} of ${total} handled: ${total} sent.`)).toBeVisible();
    await expect(page.getByRole('button', { name: 'No reminders to send' })).toBeDisabled();
    await expect(
      page.getByRole('region', { name: 'Reels due for a service' }).getByText(/^Sent /),
    ).toHaveCount(total);

    // Asking again (another tab, a double click) sends nothing more.
    const again = await request.post('/api/reminders/send', { data: { weeks: Number(weeks) } });
    expect(again.status()).toBe(202);
    expect(await again.json()).toMatchObject({ batch: { total: 0, status: 'done' } });
    await expectAccessible(page);
    await screenshots(page, 'reminders-sent');

    // The caught e-mail carries a working unsubscribe link; it needs no sign-in.
    const owner = await browser.newContext({ storageState: storageState('owner') });
    const mail = await owner.newPage();
    await mail.goto('/dev/mail');
    const reminder = mail
      .getByRole('article')
      .filter({ hasText: 'is due for a service at Marram Point' })
      .first();
    await expect(reminder).toBeVisible();
    const link = /http:\/\/\S+\/unsubscribe\/[A-Za-z0-9_-]+/.exec(
      (await reminder.locator('pre').textContent())!,
    )![0];
    await owner.close();
    const customer = await browser.newContext();
    const visit = await customer.newPage();
    await visit.goto(link);
    // Opening the link only asks; the button records the opt-out.
    await expect(
      visit.getByRole('heading', { level: 1, name: 'Stop service reminders from Marram Point?' }),
    ).toBeVisible();
    await expectAccessible(visit);
    await screenshots(visit, 'unsubscribe-ask');
    await visit.getByRole('button', { name: 'Stop service reminders' }).click();
    await expect(
      visit.getByRole('heading', { level: 1, name: 'You will get no more service reminders' }),
    ).toBeVisible();
    await expect(
      visit.getByText('Marram Point will not e-mail you about servicing your reels again.'),
    ).toBeVisible();
    await expectAccessible(visit);
    await screenshots(visit, 'unsubscribe-done');
    await visit.goto(link);
    await expect(visit.getByText(/This was already recorded/)).toBeVisible();
    await customer.close();
  });
});

test('customer – an unknown unsubscribe link says so, without signing in', async ({ page }) => {
  await page.goto('/unsubscribe/not-a-token-from-any-reminder');
  await expect(
    page.getByRole('heading', { level: 1, name: 'This link does not work' }),
  ).toBeVisible();
  await expect(page).toHaveURL(/\/unsubscribe\//);
  await expectAccessible(page);
  await screenshots(page, 'unsubscribe-unknown');
});

test.describe(() => {
  test.use({ storageState: storageState('techMarram') });
  test('technician – gets 403 for month close', async ({ page, request }) => {
    for (const [method, path] of [
      ['GET', `/api/month-close/${MONTH}`],
      ['GET', `/api/month-close/${MONTH}.csv`],
      ['POST', `/api/month-close/${MONTH}/close`],
      ['POST', `/api/month-close/${MONTH}/invoices`],
      ['GET', '/api/reminders/due?weeks=4'],
      ['POST', '/api/reminders/send'],
    ] as const) {
      const response =
        method === 'GET' ? await request.get(path) : await request.post(path, { data: {} });
      expect(response.status(), `${method} ${path}`).toBe(403);
      expect(response.headers()['content-type']).toContain('application/problem+json');
    }
    await page.goto(`/month-close?month=${MONTH}`);
    await expect(page.getByRole('heading', { name: 'Not available for your role' })).toBeVisible();
    const nav = page.getByRole('navigation', { name: 'Sections' });
    await expect(nav.getByRole('link', { name: 'Month close' })).toHaveCount(0);
    await expect(nav.getByRole('link', { name: 'Reminders' })).toHaveCount(0);
  });
});
