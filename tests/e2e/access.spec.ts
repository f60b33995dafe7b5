import { expect, test, type APIRequestContext } from '@playwright/test';
import { DEMO_PASSWORD, screenshotPath, storageState } from './accounts';
import { expectAccessible } from './axe';

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
