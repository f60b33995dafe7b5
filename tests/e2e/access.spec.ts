import { expect, test, type APIRequestContext, type Browser } from '@playwright/test';
import { DEMO_PASSWORD, screenshotPath, storageState } from './accounts';
import { expectAccessible } from './axe';
import { closedQuarter } from './clock';

async function shopIdByName(request: APIRequestContext, name: string) {
  const response = await request.get('/api/shops');
  expect(response.status()).toBe(200);
  const { shops } = (await response.json()) as { shops: { id: number; name: string }[] };
  const shop = shops.find((s) => s.name === name);
  if (!shop) throw new Error(`${name} is not among the caller's shops`);
  return shop.id;
}

test.describe('signed out', () => {
  test('visitor – is sent to sign-in from any page', async ({ page }) => {
    await page.goto('/shops');
    await expect(page).toHaveURL(/\/sign-in/);
    await expect(page.getByRole('heading', { level: 1, name: 'Sign in' })).toBeVisible();
    await expectAccessible(page);
    await page.screenshot({ path: screenshotPath('sign-in'), fullPage: true });
  });

  test('visitor – gets 401 problem documents from the API', async ({ request }) => {
    for (const path of ['/api/me', '/api/shops', '/api/users']) {
      const response = await request.get(path);
      expect(response.status(), path).toBe(401);
      expect(response.headers()['content-type']).toContain('application/problem+json');
      expect(await response.json()).toMatchObject({ status: 401, title: 'Sign-in required' });
    }
  });

  test('visitor – a wrong password gets one generic message', async ({ page }) => {
    await page.goto('/sign-in');
    await page.getByLabel('E-mail').fill('owner@saltwick.test');
    await page.getByLabel('Password').fill('not-the-password');
    await page.getByRole('button', { name: 'Sign in' }).click();
    // Next.js keeps an empty route announcer with role alert; the form's own alert is the one to read.
    const alert = page.getByRole('alert').filter({ hasText: /\S/ });
    await expect(alert).toHaveText('That e-mail and password do not match an active account.');
    await page.getByLabel('E-mail').fill('nobody@saltwick.test');
    await page.getByLabel('Password').fill(DEMO_PASSWORD);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await expect(alert).toHaveText('That e-mail and password do not match an active account.');
    await expect(page).toHaveURL(/\/sign-in/);
  });

  test('visitor – signs in with the standard next-auth flow over HTTP', async ({ request }) => {
    const { csrfToken } = (await (await request.get('/api/auth/csrf')).json()) as {
      csrfToken: string;
    };
    const signIn = await request.post('/api/auth/callback/credentials', {
      form: {
        csrfToken,
        email: 'lead.fennel@saltwick.test',
        password: DEMO_PASSWORD,
        json: 'true',
      },
    });
    expect(signIn.ok()).toBe(true);
    const me = await request.get('/api/me');
    expect(me.status()).toBe(200);
    expect(await me.json()).toMatchObject({
      email: 'lead.fennel@saltwick.test',
      role: 'shop_lead',
    });
  });

  test('health – reports the driver and that migrations are applied', async ({ request }) => {
    const response = await request.get('/api/health');
    expect(response.status()).toBe(200);
    expect(await response.json()).toMatchObject({
      status: 'ok',
      database: { driver: 'pglite', pending: 0 },
    });
  });
});

test.describe('roles and scopes', () => {
  test.describe(() => {
    test.use({ storageState: storageState('techMarram') });
    test('technician – gets 403 from an owner-only route', async ({ request, page }) => {
      const response = await request.get('/api/users');
      expect(response.status()).toBe(403);
      expect(response.headers()['content-type']).toContain('application/problem+json');
      expect(await response.json()).toMatchObject({ status: 403, type: '/problems/forbidden' });
      await page.goto('/settings');
      await expect(
        page.getByRole('heading', { name: 'Not available for your role' }),
      ).toBeVisible();
      await expect(
        page.getByRole('navigation', { name: 'Sections' }).getByRole('link', { name: 'Settings' }),
      ).toHaveCount(0);
    });

    test('technician – /api/me names their role and shop scope', async ({ request }) => {
      const me = await (await request.get('/api/me')).json();
      expect(me).toMatchObject({
        email: 'tech.marram@saltwick.test',
        role: 'technician',
        scope: { kind: 'shop' },
      });
    });
  });

  test.describe(() => {
    test.use({ storageState: storageState('owner') });
    test('owner – sees all seven shops', async ({ request }) => {
      const { shops } = await (await request.get('/api/shops')).json();
      expect(shops).toHaveLength(7);
      const users = await request.get('/api/users');
      expect(users.status()).toBe(200);
    });
  });

  test.describe(() => {
    test.use({ storageState: storageState('leadFennel') });
    test("shop lead – gets 404 for another shop's resource", async ({ request, page, browser }) => {
      const ownerContext = await browser.newContext({ storageState: storageState('owner') });
      const marramId = await shopIdByName(ownerContext.request, 'Marram Point');
      await ownerContext.close();
      const fennelId = await shopIdByName(request, 'Fennel Cove');

      expect((await request.get(`/api/shops/${fennelId}`)).status()).toBe(200);
      const other = await request.get(`/api/shops/${marramId}`);
      expect(other.status()).toBe(404);
      expect(other.headers()['content-type']).toContain('application/problem+json');
      const { shops } = await (await request.get('/api/shops')).json();
      expect(shops.map((s: { name: string }) => s.name)).toEqual(['Fennel Cove']);

      await page.goto(`/shops/${marramId}`);
      await expect(page.getByRole('heading', { level: 1, name: 'Not found' })).toBeVisible();
    });

    test('shop lead – a malformed id is a 400 with field errors', async ({ request }) => {
      const response = await request.get('/api/shops/not-a-number');
      expect(response.status()).toBe(400);
      const body = await response.json();
      expect(body.errors[0]).toMatchObject({ field: 'path.id' });
    });
  });
});

// Replays of the scope failures: the auditor read every shop's figures, a technician saw
// colleagues' revenue, and another shop's filter answered 200 with an empty list.
test.describe('scope of figures and shop filters', () => {
  const QUARTER = closedQuarter().query;
  const MISSING_SHOP = 999_999;

  async function ownerShopIds(browser: Browser) {
    const owner = await browser.newContext({ storageState: storageState('owner') });
    const ids = {
      marram: await shopIdByName(owner.request, 'Marram Point'),
      fennel: await shopIdByName(owner.request, 'Fennel Cove'),
    };
    await owner.close();
    return ids;
  }

  test.describe(() => {
    test.use({ storageState: storageState('auditor') });
    test('auditor – gets 403 from every shop figure route and the "not allowed" pages', async ({
      request,
      page,
      browser,
    }) => {
      const { marram } = await ownerShopIds(browser);
      for (const id of [marram, MISSING_SHOP]) {
        for (const path of [
          `/api/shops/${id}`,
          `/api/shops/${id}/metrics?${QUARTER}`,
          `/api/shops/${id}/trends?${QUARTER}&metric=revenue`,
        ]) {
          const response = await request.get(path);
          expect(response.status(), path).toBe(403);
          expect(response.headers()['content-type']).toContain('application/problem+json');
        }
      }
      expect((await request.get('/api/shops')).status()).toBe(403);
      expect(await (await request.get('/api/me')).json()).toMatchObject({
        role: 'auditor',
        scope: { kind: 'rounds' },
      });

      await page.goto('/');
      await expect(page.getByRole('heading', { level: 1, name: 'Shops to audit' })).toBeVisible();
      await expect(page.getByRole('region', { name: 'Your audit rounds' })).toBeVisible();
      await expect(page.getByRole('region', { name: 'Shops' })).toHaveCount(0);
      const nav = page.getByRole('navigation', { name: 'Sections' });
      await expect(nav.getByRole('link', { name: 'Network' })).toHaveCount(0);
      await expect(nav.getByRole('link', { name: 'Shop', exact: true })).toHaveCount(0);
      for (const path of [`/shops/${marram}`, '/network']) {
        await page.goto(path);
        await expect(
          page.getByRole('heading', { name: 'Not available for your role' }),
        ).toBeVisible();
      }
    });
  });

  test.describe(() => {
    test.use({ storageState: storageState('techMarram') });
    test("technician – sees their own revenue row, never a colleague's", async ({
      request,
      browser,
    }) => {
      const { marram } = await ownerShopIds(browser);
      const me = (await (await request.get('/api/me')).json()) as { id: number };
      const mine = await request.get(`/api/shops/${marram}/metrics?${QUARTER}`);
      expect(mine.status()).toBe(200);
      const { byTechnician } = (await mine.json()) as { byTechnician: { key: string }[] };
      expect(byTechnician.map((g) => g.key)).toEqual([String(me.id)]);

      // The shop's lead still sees the whole split, so there were colleagues to hide.
      const lead = await browser.newContext({ storageState: storageState('leadMarram') });
      const all = (await (
        await lead.request.get(`/api/shops/${marram}/metrics?${QUARTER}`)
      ).json()) as { byTechnician: { key: string }[] };
      await lead.close();
      expect(all.byTechnician.length).toBeGreaterThan(1);
    });
  });

  test.describe(() => {
    test.use({ storageState: storageState('managerNorth') });
    test('regional manager – a shop filter outside the region or missing is a 404', async ({
      request,
      browser,
    }) => {
      const { marram, fennel } = await ownerShopIds(browser);
      for (const list of [
        '/api/corrective-actions?shopId=',
        '/api/audit-rounds?shopId=',
        '/api/comebacks?shop=',
        '/api/jobs?shopId=',
      ]) {
        expect((await request.get(`${list}${marram}`)).status(), `${list} own`).toBe(200);
        for (const id of [fennel, MISSING_SHOP]) {
          const response = await request.get(`${list}${id}`);
          expect(response.status(), `${list}${id}`).toBe(404);
          expect(response.headers()['content-type']).toContain('application/problem+json');
        }
      }
    });
  });

  test.describe(() => {
    test.use({ storageState: storageState('leadFennel') });
    test("shop lead – another shop's reminders are a 404", async ({ request, browser }) => {
      const { marram, fennel } = await ownerShopIds(browser);
      for (const list of ['/api/reminders/due?shop=', '/api/reminders/batches?shop=']) {
        expect((await request.get(`${list}${fennel}`)).status(), `${list} own`).toBe(200);
        expect((await request.get(`${list}${marram}`)).status(), `${list} other`).toBe(404);
        expect((await request.get(`${list}${MISSING_SHOP}`)).status(), `${list} missing`).toBe(404);
      }
    });
  });
});
