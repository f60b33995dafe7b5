import { expect, test, type APIRequestContext, type Browser, type Page } from '@playwright/test';
import { screenshotPath, storageState } from './accounts';
import { expectAccessible } from './axe';

const TABLET = { width: 1024, height: 768 };

async function shopId(request: APIRequestContext, name: string) {
  const { shops } = (await (await request.get('/api/shops')).json()) as {
    shops: { id: number; name: string }[];
  };
  const shop = shops.find((s) => s.name === name);
  if (!shop) throw new Error(`${name} is not among the caller's shops`);
  return shop.id;
}

/** Any open state: which of them the demo's open jobs are in depends on the seed's draws. */
const OPEN = 'checked_in,on_bench,waiting_parts';

/** A Marram Point job in the given state(s), found through the owner's view of the list. */
async function marramJob(browser: Browser, state: string) {
  const owner = await browser.newContext({ storageState: storageState('owner') });
  const id = await shopId(owner.request, 'Marram Point');
  const response = await owner.request.get(`/api/jobs?shopId=${id}&state=${state}&pageSize=25`);
  expect(response.status()).toBe(200);
  const { jobs } = (await response.json()) as { jobs: { id: number }[] };
  await owner.close();
  if (!jobs[0]) throw new Error(`No Marram Point job is ${state}`);
  return jobs[0].id;
}

/** The whole page and what the first screen shows, at desktop and tablet sizes. */
async function shoot(page: Page, name: string) {
  await page.screenshot({ path: screenshotPath(`${name}-1280`), fullPage: true });
  await page.screenshot({ path: screenshotPath(`${name}-1280-screen`) });
  await page.setViewportSize(TABLET);
  await page.screenshot({ path: screenshotPath(`${name}-1024`), fullPage: true });
  await page.screenshot({ path: screenshotPath(`${name}-1024-screen`) });
  await page.setViewportSize({ width: 1280, height: 900 });
}

test.describe('technician at Marram Point', () => {
  test.use({ storageState: storageState('techMarram') });

  test('technician – checks a reel in, times it, ticks the checklist, adds a part and hands it back', async ({
    page,
  }, testInfo) => {
    // A new customer each attempt: a retry finds the first attempt's customer otherwise.
    const customer = `Wren Quillfeather${['', ' Ashby', ' Corran'][testInfo.retry] ?? ''}`;
    await page.goto('/bench/new');
    await expect(page.getByRole('heading', { level: 1, name: 'Check a reel in' })).toBeVisible();
    // The promised date comes suggested from the shop's turnaround.
    await expect(page.getByLabel('Promised for pickup')).not.toHaveValue('');
    await expect(page.getByText(/^Suggested: \d+ business days?/)).toBeVisible();

    await page.getByLabel('Find the customer').fill(customer);
    await expect(page.getByText(`No customer matches “${customer}”.`)).toBeVisible();
    await page.getByRole('button', { name: 'Add a new customer' }).click();
    await expect(page.getByLabel('Name', { exact: true })).toHaveValue(customer);
    await page.getByLabel('E-mail (optional)').fill('wren.quillfeather@example.test');
    await page.getByLabel('Agrees to pre-season service reminders by e-mail').check();

    // Submitting with gaps lists what is missing, each linked to its field.
    await page.getByRole('button', { name: 'Check the reel in' }).click();
    const summary = page.getByRole('alert').filter({ hasText: 'Some fields need attention.' });
    await expect(summary).toBeVisible();
    await expect(summary.getByRole('link', { name: 'Choose the kind of reel' })).toBeVisible();
    await expect(summary.getByRole('link', { name: 'Choose a service' })).toBeVisible();

    // Hooks left on a reel are the first hazard of a check-in.
    await expect(page.getByText(/hooks or lures still tied on/)).toBeVisible();
    await page.getByLabel('Kind').selectOption({ label: 'Spinning' });
    await page.getByLabel('Maker').fill('Inventa Reelworks');
    await page.getByLabel('Model', { exact: true }).fill('Testline');
    await page.getByLabel('Size (optional)').fill('3000');
    await page.getByLabel('Gear ratio (optional)').fill('5.8:1');
    await page.getByRole('radio', { name: /Salt water/ }).check();
    await page.getByRole('radio', { name: /Tune-up/ }).check();
    await page.getByLabel('What the customer says').fill('Rough when cranking; yearly service.');
    await page.getByLabel('Condition at check-in').fill('Light salt crust on the spool lip.');
    await expectAccessible(page);
    await shoot(page, 'bench-check-in');

    await page.getByRole('button', { name: 'Check the reel in' }).click();
    await expect(page).toHaveURL(/\/bench\/jobs\/\d+$/);
    const jobId = Number(page.url().split('/').pop());
    const heading = page.getByRole('heading', { level: 1 });
    await expect(heading).toContainText(`Job #${jobId}`);
    await expect(heading).toContainText('Checked in');
    await expect(page.getByText(customer, { exact: true })).toBeVisible();

    await page.getByRole('button', { name: 'Start bench work' }).click();
    await expect(heading).toContainText('On the bench');

    const bench = page.getByRole('region', { name: 'Bench time' });
    await bench.getByRole('button', { name: 'Start timer' }).click();
    await expect(bench.getByRole('timer')).toBeVisible();
    await expect(bench.getByRole('timer')).toHaveText(/00:00:0[1-9]/);
    await bench.getByRole('button', { name: 'Stop timer' }).click();
    await expect(bench.getByRole('button', { name: 'Start timer' })).toBeVisible();
    await bench.getByLabel('Add minutes by hand').fill('25');
    await bench.getByRole('button', { name: 'Add minutes' }).click();
    await expect(bench.getByText('25 min logged on this job.')).toBeVisible();

    const checklist = page.getByRole('region', { name: 'Service checklist' });
    await expect(checklist.getByText(/Caution:/).first()).toBeVisible();
    await expect(checklist.getByText(/safety data sheets/)).toBeVisible();
    // The usual cautions sit beside the steps that need them (compressed air, grease, line under load).
    await expect(checklist.getByText(/never spin a bearing with the air jet/)).toBeVisible();
    await expect(checklist.getByText(/grease and oil irritate skin/).first()).toBeVisible();
    await expect(checklist.getByText(/Line under load can snap back/).first()).toBeVisible();
    const boxes = checklist.getByRole('checkbox');
    const count = await boxes.count();
    expect(count).toBeGreaterThan(5);
    for (let i = 0; i < count; i++) await boxes.nth(i).check();
    await expect(checklist.getByText(`${count} of ${count} steps ticked`)).toBeVisible();
    await expect(checklist.getByText('every required step is done')).toBeVisible();

    const parts = page.getByRole('region', { name: 'Parts', exact: true });
    await parts.getByLabel('Part', { exact: true }).fill('Carbon drag washer set');
    await parts.getByLabel('Part number (optional)').fill('SSR-DW-210');
    await parts.getByLabel('Quantity').fill('2');
    await parts.getByLabel('Unit price ($)').fill('14.50');
    await parts.getByRole('button', { name: 'Add part' }).click();
    await expect(parts.getByRole('rowheader', { name: 'Carbon drag washer set' })).toBeVisible();
    await expect(parts.getByRole('row', { name: /Parts total/ })).toContainText('$29.00');

    const charges = page.getByRole('region', { name: 'Charges' });
    await expect(charges.getByText('Total', { exact: true })).toBeVisible();
    const notes = page.getByRole('region', { name: 'Notes and findings' });
    await notes.getByLabel('Findings').fill('Drag washers glazed; replaced. Bail spring fine.');
    await notes.getByRole('button', { name: 'Save notes' }).click();
    await expect(notes.getByText('Saved.')).toBeVisible();

    await expectAccessible(page);
    await shoot(page, 'bench-job-on-bench');

    await page.getByRole('button', { name: 'Ready for pickup' }).click();
    await expect(heading).toContainText('Ready for pickup');
    const timeline = page.getByRole('region', { name: 'Timeline' });
    await expect(timeline.getByText('Turnaround in opening hours')).toBeVisible();
    await page.getByRole('button', { name: 'Collected by the customer' }).click();
    await expect(heading).toContainText('Collected');
    await expect(page.getByRole('group', { name: 'Move the job' })).toHaveCount(0);
    await expect(timeline.getByRole('listitem')).toHaveText([
      /Checked in/,
      /On the bench/,
      /Ready for pickup/,
      /Collected/,
    ]);
    const me = (await (await page.request.get('/api/me')).json()) as { name: string };
    await expect(timeline.getByRole('listitem').first()).toContainText(me.name);

    // The list finds the job by its customer.
    await page.goto(`/bench?q=${encodeURIComponent('Quillfeather')}`);
    await expect(page.getByRole('link', { name: `#${jobId}` })).toBeVisible();
  });

  test('technician – a refused move is a 409 problem document', async ({ request, browser }) => {
    const id = await marramJob(browser, 'checked_in');
    const response = await request.post(`/api/jobs/${id}/transitions`, { data: { to: 'ready' } });
    expect(response.status()).toBe(409);
    expect(response.headers()['content-type']).toContain('application/problem+json');
    expect(await response.json()).toMatchObject({ status: 409, title: 'Conflict' });
  });

  test('technician – filters, sorts and pages the job list', async ({ page }) => {
    await page.goto('/bench');
    await expect(page.getByRole('heading', { level: 1, name: 'Bench' })).toBeVisible();
    const table = page.getByRole('table', { name: /Jobs/ });
    const rows = table.locator('tbody tr');
    await expect(rows).toHaveCount(25);
    const status = page.getByText(/^1–25 of [\d,]+ jobs/);
    await expect(status).toBeVisible();
    const total = Number((await status.textContent())!.match(/of ([\d,]+)/)![1]!.replace(/,/g, ''));
    expect(total).toBeGreaterThan(1000);
    await expectAccessible(page);
    await shoot(page, 'bench-list');

    await page.getByRole('button', { name: 'Next' }).click();
    await expect(page).toHaveURL(/page=2/);
    await expect(page.getByText(/^26–50 of/)).toBeVisible();

    await page.getByRole('button', { name: 'Waiting on parts', pressed: false }).click();
    await expect(page).toHaveURL(/state=waiting_parts/);
    await expect(page).not.toHaveURL(/page=2/);
    await expect(rows.first()).toContainText('Waiting on parts');
    const states = await table.locator('tbody tr td:nth-child(3)').allTextContents();
    expect(states.every((s) => s === 'Waiting on parts')).toBe(true);

    await page.getByRole('button', { name: /In state/ }).click();
    await expect(page).toHaveURL(/sort=stateChangedAt&?/);
    await expect(table.getByRole('columnheader', { name: /In state/ })).toHaveAttribute(
      'aria-sort',
      'descending',
    );
    const days = (await table.locator('tbody tr td:nth-child(4)').allTextContents()).map((t) =>
      parseInt(t, 10),
    );
    expect(days).toEqual([...days].sort((a, b) => b - a));

    await page.getByLabel('In state more than (days)').fill('3');
    await expect(page).toHaveURL(/waitingDays=3/);
    await expect(rows.first()).toBeVisible();
    const waited = (await table.locator('tbody tr td:nth-child(4)').allTextContents()).map((t) =>
      parseInt(t, 10),
    );
    expect(waited.every((d) => d >= 3)).toBe(true);

    await page.getByRole('button', { name: 'Clear filters' }).click();
    await expect(page).toHaveURL(/\/bench$/);
    const name = (await rows.first().locator('td:nth-child(2) span').first().textContent())!;
    await page.getByLabel('Search', { exact: true }).fill(name);
    await expect(page).toHaveURL(/q=/);
    await expect(rows.first()).toContainText(name);
    const names = await table
      .locator('tbody tr td:nth-child(2) span:first-child')
      .allTextContents();
    expect(names.every((n) => n === name)).toBe(true);

    await page.getByLabel('Service', { exact: true }).selectOption({ label: 'Repair' });
    await expect(page).toHaveURL(/service=repair/);
  });
});

test.describe('technician at Fennel Cove', () => {
  test.use({ storageState: storageState('techFennel') });

  test("technician – cannot see another shop's job", async ({ page, request, browser }) => {
    const id = await marramJob(browser, OPEN);
    const response = await request.get(`/api/jobs/${id}`);
    expect(response.status()).toBe(404);
    expect(response.headers()['content-type']).toContain('application/problem+json');
    const write = await request.post(`/api/jobs/${id}/parts`, {
      data: { name: 'x', quantity: 1, unitPriceCents: 100 },
    });
    expect(write.status()).toBe(404);
    await page.goto(`/bench/jobs/${id}`);
    await expect(page.getByRole('heading', { level: 1, name: 'Not found' })).toBeVisible();
    await page.goto(`/bench?q=%23${id}`);
    await expect(page.getByText('No jobs match these filters.')).toBeVisible();
  });
});

test.describe('regional manager of the North Shore', () => {
  test.use({ storageState: storageState('managerNorth') });

  test('regional manager – reads a job without write controls', async ({
    page,
    request,
    browser,
  }) => {
    const id = await marramJob(browser, OPEN);
    await page.goto(`/bench/jobs/${id}`);
    await expect(page.getByRole('heading', { level: 1 })).toContainText(`Job #${id}`);
    await expect(page.getByRole('region', { name: 'Service checklist' })).toBeVisible();
    await expect(
      page.getByRole('region', { name: 'Timeline' }).getByRole('listitem').first(),
    ).toBeVisible();
    await expect(page.getByRole('group', { name: 'Move the job' })).toHaveCount(0);
    await expect(page.getByRole('checkbox')).toHaveCount(0);
    await expect(page.getByRole('button', { name: /timer|Add part|Save notes|Apply/ })).toHaveCount(
      0,
    );
    await expect(page.getByRole('combobox')).toHaveCount(0);
    await expectAccessible(page);
    await shoot(page, 'bench-job-read-only');

    const patch = await request.patch(`/api/jobs/${id}`, { data: { findings: 'no' } });
    expect(patch.status()).toBe(403);
    await page.goto('/bench');
    await expect(page.getByRole('link', { name: 'Check a reel in' })).toHaveCount(0);
    await expect(page.getByLabel('Shop')).toBeVisible();
  });
});

test.describe('auditor', () => {
  test.use({ storageState: storageState('auditor') });

  test('auditor – has no Bench section and gets 403 from the bench API', async ({
    page,
    request,
  }) => {
    expect((await request.get('/api/jobs')).status()).toBe(403);
    expect((await request.get('/api/customers?query=ab')).status()).toBe(403);
    await page.goto('/');
    await expect(
      page.getByRole('navigation', { name: 'Sections' }).getByRole('link', { name: 'Bench' }),
    ).toHaveCount(0);
  });
});
