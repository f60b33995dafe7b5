import { readFile } from 'node:fs/promises';
import { expect, test, type APIRequestContext, type Page } from '@playwright/test';
import { screenshotPath, storageState } from './accounts';
import { expectAccessible } from './axe';
import { closedQuarter } from './clock';

// A quarter whose comeback figures are final (every warranty window closed); the story is told in it.
const { from: Q_FROM, to: Q_TO, query: QUARTER } = closedQuarter();
const NORTH = ['Marram Point', 'Saltwick Harbor', 'Skerry Wharf', 'Ternhollow Lake'];
const SOUTH = ['Brackwater Flats', 'Fennel Cove', 'Lantern Inlet'];

interface ShopRow {
  shop: { id: number; name: string; region: { name: string } };
  jobsReady: number;
  customerTurnaround: { p90: number | null };
  benchTurnaround: { p90: number | null };
  comebacks: { events: number; trials: number; rate: number | null; band: string | null };
}

async function shopIdByName(request: APIRequestContext, name: string) {
  const { shops } = (await (await request.get('/api/shops')).json()) as {
    shops: { id: number; name: string }[];
  };
  const shop = shops.find((s) => s.name === name);
  if (!shop) throw new Error(`${name} is not among the caller's shops`);
  return shop.id;
}

const shopTable = (page: Page) => page.getByRole('table', { name: /^Shops side by side/ });

/** The shop names of the table's body rows, in order. */
async function rowNames(page: Page) {
  return shopTable(page).locator('tbody tr th[scope=row] a').allInnerTexts();
}

/** A small CSV reader for the download (quoted fields, doubled quotes). */
function parseCsv(text: string): string[][] {
  const rows: string[][] = [];
  let row: string[] = [];
  let field = '';
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const ch = text[i]!;
    if (quoted) {
      if (ch === '"' && text[i + 1] === '"') {
        field += '"';
        i++;
      } else if (ch === '"') quoted = false;
      else field += ch;
    } else if (ch === '"') quoted = true;
    else if (ch === ',') {
      row.push(field);
      field = '';
    } else if (ch === '\n' || ch === '\r') {
      if (ch === '\r' && text[i + 1] === '\n') i++;
      row.push(field);
      rows.push(row);
      row = [];
      field = '';
    } else field += ch;
  }
  if (field !== '' || row.length > 0) rows.push([...row, field]);
  return rows;
}

async function shoot(page: Page, name: string) {
  for (const [w, h] of [
    [1280, 900],
    [1024, 768],
  ] as const) {
    await page.setViewportSize({ width: w, height: h });
    // Charts draw after hydration and resize with the window.
    await page.waitForTimeout(400);
    await page.screenshot({ path: screenshotPath(`${name}-${w}x${h}`), fullPage: true });
  }
  await page.setViewportSize({ width: 1280, height: 900 });
}

test.describe('network view', () => {
  test('regional manager – sees only northern shops, sorts by comeback rate, opens the out-of-line shop', async ({
    browser,
  }) => {
    const north = await browser.newContext({ storageState: storageState('managerNorth') });
    const northPage = await north.newPage();
    await northPage.goto(`/network?${QUARTER}`);
    await expect(
      northPage.getByRole('heading', { level: 1, name: 'North Shore shops' }),
    ).toBeVisible();
    expect((await rowNames(northPage)).sort()).toEqual(NORTH);
    await expect(
      northPage
        .getByRole('navigation', { name: 'Sections' })
        .getByRole('link', { name: 'Network' }),
    ).toBeVisible();
    await north.close();

    // The out-of-line shop of the demo, Brackwater Flats, is in the south.
    const south = await browser.newContext({ storageState: storageState('managerSouth') });
    const southPage = await south.newPage();
    await southPage.goto(`/network?${QUARTER}`);
    expect((await rowNames(southPage)).sort()).toEqual(SOUTH);
    const rateHeader = shopTable(southPage).getByRole('columnheader', { name: 'Comeback rate' });
    await rateHeader.getByRole('button').click();
    await expect(rateHeader).toHaveAttribute('aria-sort', 'descending');
    const first = shopTable(southPage).locator('tbody tr').first();
    await expect(first.locator('th')).toContainText('Brackwater Flats');
    await expect(first).toContainText('Out of line · high');
    // Sorting again puts the lowest rate first.
    await rateHeader.getByRole('button').click();
    await expect(rateHeader).toHaveAttribute('aria-sort', 'ascending');
    expect((await rowNames(southPage)).at(-1)).toBe('Brackwater Flats');
    await southPage.getByRole('link', { name: 'Brackwater Flats' }).click();
    await expect(
      southPage.getByRole('heading', { level: 1, name: 'Brackwater Flats' }),
    ).toBeVisible();
    await expect(southPage).toHaveURL(new RegExp(`/shops/\\d+\\?${QUARTER}`));
    await expect(southPage.getByText('Out of line · high').first()).toBeVisible();
    await south.close();
  });

  test.describe(() => {
    test.use({ storageState: storageState('owner') });

    test('owner – downloads the network table as CSV', async ({ page }) => {
      await page.goto(`/network?${QUARTER}`);
      await expect(shopTable(page).locator('tbody tr')).toHaveCount(7);
      const downloading = page.waitForEvent('download');
      await page.getByRole('button', { name: 'Download CSV' }).click();
      const download = await downloading;
      expect(download.suggestedFilename()).toBe(`reelwright-network-${Q_FROM}-to-${Q_TO}.csv`);
      const text = await readFile((await download.path())!, 'utf8');
      // One line break after the last row, not two.
      expect(text.endsWith('\r\n')).toBe(true);
      expect(text.endsWith('\r\n\r\n')).toBe(false);
      const [header, ...rows] = parseCsv(text.trimEnd());
      const col = (name: string) => {
        const i = header!.indexOf(name);
        expect(i, name).toBeGreaterThanOrEqual(0);
        return i;
      };
      const names = await rowNames(page);
      expect(rows.map((r) => r[col('Shop')])).toEqual(names);
      for (const [i, name] of names.entries()) {
        const row = shopTable(page).locator('tbody tr').nth(i);
        const csv = rows[i]!;
        const cells = row.locator('td');
        await expect(cells.nth(0)).toHaveText(
          Number(csv[col('Jobs ready')]).toLocaleString('en-US'),
          {
            useInnerText: true,
          },
        );
        // The table rounds the rate the CSV gives in full counts.
        const events = Number(csv[col('Comebacks counted')]);
        const trials = Number(csv[col('Comeback trials')]);
        const shown = trials === 0 ? '—' : `${((100 * events) / trials).toFixed(1)}%`;
        await expect(cells.nth(6), name).toContainText(shown, { useInnerText: true });
        expect(Number(csv[col('Comeback rate (%)')])).toBeCloseTo((100 * events) / trials, 2);
        await expect(cells.nth(6), name).toContainText(
          { 'in line': 'In line', 'on watch': 'On watch', 'out of line': 'Out of line' }[
            csv[col('Comeback band')]!
          ]!,
          { useInnerText: true },
        );
        await expect(cells.nth(7)).toHaveText(`$${csv[col('Revenue per bench hour ($)')]}`, {
          useInnerText: true,
        });
      }
    });

    test('owner – the demo story shows in a quarter with final figures', async ({ request }) => {
      const response = await request.get(`/api/network/comparison?${QUARTER}`);
      expect(response.status()).toBe(200);
      const body = (await response.json()) as {
        shops: ShopRow[];
        network: { comebacks: { rate: number } };
      };
      const by = (name: string) => body.shops.find((s) => s.shop.name === name)!;
      expect(by('Brackwater Flats').comebacks.band).toBe('out of line');
      // Ternhollow Lake's raw rate is the highest of the shops not out of line, above the
      // network.s, yet in line for its small volume.
      const ternhollow = by('Ternhollow Lake');
      const rates = body.shops
        .filter((s) => s.comebacks.band !== 'out of line')
        .map((s) => s.comebacks.rate ?? 0);
      expect(ternhollow.comebacks.rate).toBe(Math.max(...rates));
      expect(ternhollow.comebacks.rate!).toBeGreaterThan(body.network.comebacks.rate);
      expect(ternhollow.comebacks.band).toBe('in line');
      // Skerry Wharf's reels wait on parts: long customer turnaround, ordinary bench turnaround.
      const skerry = by('Skerry Wharf');
      const others = body.shops.filter((s) => s.shop.name !== 'Skerry Wharf');
      const maxOther = (pick: (s: ShopRow) => number | null) =>
        Math.max(...others.map((s) => pick(s) ?? 0));
      const waiting = (s: ShopRow) => s.customerTurnaround.p90! - s.benchTurnaround.p90!;
      expect(skerry.customerTurnaround.p90!).toBeGreaterThan(
        maxOther((s) => s.customerTurnaround.p90),
      );
      expect(waiting(skerry)).toBeGreaterThan(2 * maxOther(waiting));
      expect(skerry.benchTurnaround.p90!).toBeLessThanOrEqual(
        maxOther((s) => s.benchTurnaround.p90),
      );
    });

    test('owner – bad dates get 400 with field errors; a region filter narrows the table', async ({
      request,
      page,
    }) => {
      const bad = await request.get('/api/network/comparison?from=2026-02-30&to=yesterday');
      expect(bad.status()).toBe(400);
      expect(bad.headers()['content-type']).toContain('application/problem+json');
      const problem = (await bad.json()) as { errors: { field: string }[] };
      expect(problem.errors.map((e) => e.field).sort()).toEqual(['query.from', 'query.to']);
      const backwards = await request.get(`/api/network/comparison?from=${Q_TO}&to=${Q_FROM}`);
      expect(backwards.status()).toBe(400);
      expect((await backwards.json()).errors).toEqual([
        { field: 'query.to', message: 'Must be on or after from' },
      ]);

      await page.goto(`/network?${QUARTER}`);
      await page.getByLabel('Region').selectOption({ label: 'South Shore' });
      await page.getByRole('button', { name: 'Show' }).click();
      await expect(page).toHaveURL(/region=\d+/);
      await expect(shopTable(page).locator('tbody tr')).toHaveCount(3);
      expect((await rowNames(page)).sort()).toEqual(SOUTH);
    });

    test('owner – the network view is accessible and reads well on desktop and tablet', async ({
      page,
    }) => {
      await page.goto('/network');
      await expect(page.getByRole('heading', { level: 1, name: 'Network' })).toBeVisible();
      // The default period is the last whole month, and the page says why.
      await expect(page.getByLabel('Period')).toHaveValue('month');
      await expect(page.getByText(/^Showing \w{3} \d{4}, the last whole month\./)).toBeVisible();
      await expect(
        page.getByRole('figure', {
          name: /^Comebacks observed ÷ expected against comebacks expected/,
        }),
      ).toBeVisible();
      // Charts draw once the page has hydrated and they scroll near; the explanations need
      // hydration too.
      await page
        .getByRole('figure', { name: /^Comebacks observed ÷ expected against comebacks expected/ })
        .scrollIntoViewIfNeeded();
      await expect(page.locator('.recharts-surface').first()).toBeVisible();
      // Explanations show on keyboard focus as well as on hover.
      const rate = shopTable(page)
        .locator('tbody tr')
        .first()
        .locator('td')
        .nth(6)
        .getByRole('button')
        .first();
      await rate.focus();
      await expect(page.getByRole('tooltip').filter({ visible: true })).toContainText('came back');
      await page.keyboard.press('Escape');
      await expect(page.getByRole('tooltip').filter({ visible: true })).toHaveCount(0);
      // And on hover: the on-time share of the first shop.
      await shopTable(page)
        .locator('tbody tr')
        .first()
        .locator('td')
        .nth(5)
        .getByRole('button')
        .hover();
      await expect(page.getByRole('tooltip').filter({ visible: true })).toContainText(
        'promised time',
      );
      await page.mouse.move(0, 0);
      await expectAccessible(page);
      await shoot(page, 'network-owner');
      await page.getByLabel('Business days').check();
      await expect(page).toHaveURL(/units=days/);
      await expect(shopTable(page).locator('tbody tr').first().locator('td').nth(1)).toContainText(
        ' d',
        {
          useInnerText: true,
        },
      );
    });

    test('owner – a shop page shows its figures over time and links to the bench', async ({
      page,
    }) => {
      await page.goto(`/network?${QUARTER}`);
      await page.getByRole('link', { name: 'Skerry Wharf' }).click();
      await expect(page.getByRole('heading', { level: 1, name: 'Skerry Wharf' })).toBeVisible();
      await expect(
        page.getByRole('figure', { name: /Customer turnaround of the \d+ jobs ready/ }),
      ).toBeVisible();
      await expect(
        page.getByRole('table', { name: /Comebacks of jobs collected in/ }),
      ).toBeVisible();
      await expect(page.getByRole('table', { name: /Open jobs at Skerry Wharf/ })).toBeVisible();
      const waiting = page.getByRole('link', { name: /waiting on parts.*in the bench list/ });
      await expect(waiting).toHaveAttribute('href', /\/bench\?shopId=\d+&state=waiting_parts/);
      await expectAccessible(page);
      await shoot(page, 'shop-skerry-owner');
    });
  });

  test.describe(() => {
    test.use({ storageState: storageState('techMarram') });
    test('technician – gets 403 from the comparison API', async ({ request, page }) => {
      const response = await request.get(`/api/network/comparison?${QUARTER}`);
      expect(response.status()).toBe(403);
      expect(response.headers()['content-type']).toContain('application/problem+json');
      expect(await response.json()).toMatchObject({ status: 403, type: '/problems/forbidden' });
      expect((await request.get(`/api/network/trends?${QUARTER}&metric=comebacks`)).status()).toBe(
        403,
      );
      await page.goto('/network');
      await expect(
        page.getByRole('heading', { name: 'Not available for your role' }),
      ).toBeVisible();
      await expect(
        page.getByRole('navigation', { name: 'Sections' }).getByRole('link', { name: 'Network' }),
      ).toHaveCount(0);
    });
  });

  test.describe(() => {
    test.use({ storageState: storageState('managerNorth') });
    test("regional manager – another region's shop is 404", async ({ request, page, browser }) => {
      const owner = await browser.newContext({ storageState: storageState('owner') });
      const brackwater = await shopIdByName(owner.request, 'Brackwater Flats');
      const { regions } = (await (
        await owner.request.get(`/api/network/comparison?${QUARTER}`)
      ).json()) as {
        regions: { id: number; name: string }[];
      };
      const southId = regions.find((r) => r.name === 'South Shore')!.id;
      await owner.close();
      const skerry = await shopIdByName(request, 'Skerry Wharf');
      expect((await request.get(`/api/shops/${skerry}/metrics?${QUARTER}`)).status()).toBe(200);
      for (const path of [
        `/api/shops/${brackwater}/metrics?${QUARTER}`,
        `/api/shops/${brackwater}/trends?${QUARTER}&metric=turnaround`,
      ]) {
        const response = await request.get(path);
        expect(response.status(), path).toBe(404);
        expect(response.headers()['content-type']).toContain('application/problem+json');
      }
      expect(
        (await request.get(`/api/network/comparison?${QUARTER}&region=${southId}`)).status(),
      ).toBe(404);
      await page.goto(`/shops/${brackwater}`);
      await expect(page.getByRole('heading', { level: 1, name: 'Not found' })).toBeVisible();
    });
  });
});
