import { expect, test, type Page } from '@playwright/test';
import { storageState } from './accounts';
import { closedQuarter } from './clock';

// The figures are painted from the server's HTML: with JavaScript off nothing could fetch them
// after the page arrives, so whatever shows came from the server render.

const NORTH = ['Marram Point', 'Saltwick Harbor', 'Skerry Wharf', 'Ternhollow Lake'];
// A quarter given in the address, so the page's figures can be held against the API's.
const QUARTER = closedQuarter();

interface ComparisonShop {
  shop: { name: string };
  jobsReady: number;
}

const shopTable = (page: Page) => page.getByRole('table', { name: /^Shops side by side/ });

/** Shop name → the "Jobs ready" figure of its row, as the table shows it. */
async function jobsReadyByShop(page: Page) {
  const table = shopTable(page);
  const headings = await table.locator('thead tr').last().locator('th').allInnerTexts();
  const rows = table.locator('tbody tr');
  const out = new Map<string, string>();
  for (let i = 0; i < (await rows.count()); i++) {
    const row = rows.nth(i);
    const name = (await row.locator('th[scope=row] a').innerText()).trim();
    // The first cell after the shop's name is "Jobs ready" (checked against the header below).
    const figure = row.locator('td').first().getByRole('button');
    out.set(name, (await figure.innerText()).trim());
  }
  return { headings, figures: out };
}

test.describe('figures in the server-rendered HTML', () => {
  test.use({ storageState: storageState('managerNorth'), javaScriptEnabled: false });

  test('regional manager – the network page shows every shop and its figures without JavaScript', async ({
    page,
  }) => {
    await page.goto('/network');
    await expect(page.getByText(/^Loading/)).toHaveCount(0);
    await expect(page.getByRole('heading', { level: 1, name: 'North Shore shops' })).toBeVisible();
    const { headings, figures } = await jobsReadyByShop(page);
    expect(headings[1]?.trim()).toBe('Jobs ready');
    expect([...figures.keys()].sort()).toEqual(NORTH);
    for (const [name, figure] of figures) {
      expect(figure, `${name}'s jobs ready`).toMatch(/^\d[\d,]*$/);
    }
    // The network facts above the table: jobs ready and the network's comeback rate.
    const fact = (label: RegExp) =>
      page
        .locator('main dl > div')
        .filter({ has: page.locator('dt', { hasText: label }) })
        .locator('dd button');
    await expect(fact(/^Jobs ready$/)).toHaveText(/^\d[\d,]*$/);
    await expect(fact(/^Network comeback rate/)).toHaveText(/^\d+(\.\d)?%$/);
  });

  test('regional manager – the network page served for a quarter carries the API figures', async ({
    page,
  }) => {
    const response = await page.request.get(
      `/api/network/comparison?from=${QUARTER.from}&to=${QUARTER.to}`,
    );
    expect(response.status()).toBe(200);
    const api = (await response.json()) as { shops: ComparisonShop[] };
    await page.goto(`/network?from=${QUARTER.from}&to=${QUARTER.to}`);
    const { figures } = await jobsReadyByShop(page);
    expect(figures.size).toBe(api.shops.length);
    for (const s of api.shops) {
      expect(figures.get(s.shop.name), s.shop.name).toBe(s.jobsReady.toLocaleString('en-US'));
    }
  });

  test('shop lead – the shop page shows its figures and turnaround histograms without JavaScript', async ({
    browser,
  }) => {
    const context = await browser.newContext({
      storageState: storageState('leadMarram'),
      javaScriptEnabled: false,
    });
    const page = await context.newPage();
    const me = (await (await page.request.get('/api/me')).json()) as { scope: { shopId: number } };
    await page.goto(`/shops/${me.scope.shopId}`);
    await expect(page.getByRole('heading', { level: 1, name: 'Marram Point' })).toBeVisible();
    await expect(page.getByText(/^Loading/)).toHaveCount(0);
    await expect(page.getByRole('heading', { name: /^Figures for / })).toBeVisible();
    // The histograms are drawn on the server: one bar per band of time, with the median marked.
    const histogram = page.locator('figure[aria-labelledby="histogram-customer-title"]');
    await expect(
      histogram.getByRole('heading', { name: /^Customer turnaround of the/ }),
    ).toBeVisible();
    await expect(histogram.locator('svg rect').first()).toBeAttached();
    await expect(histogram.locator('svg text', { hasText: /^Median \d/ })).toHaveCount(1);
    await context.close();
  });
});
