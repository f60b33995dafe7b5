import { expect, request as playwrightRequest, test, type Cookie } from '@playwright/test';
import { DEMO_PASSWORD, screenshotPath, storageState } from './accounts';

// Signing out ends every session of the account, and a sign-in block outlives this file, so both
// tests use demo accounts that no other spec (and not auth.setup.ts) signs in with. The throttled
// attempts also come from a documentation address: the test server trusts one proxy hop
// (TRUSTED_PROXY_HOPS=1 in serve.sh), so the block never reaches 127.0.0.1, where the other specs
// sign in from.
const LEAD = { email: 'lead.skerry@saltwick.test', landing: 'Skerry Wharf today' };
const BLOCKED = 'tech2.lantern@saltwick.test';
const ATTACKER = { 'x-forwarded-for': '203.0.113.50' };

const sessionCookie = (cookies: Cookie[]) =>
  cookies.find((c) => c.name.endsWith('next-auth.session-token'));

test('shop lead – after signing out, the old cookie reads and writes nothing', async ({
  browser,
  baseURL,
}) => {
  const context = await browser.newContext();
  const page = await context.newPage();
  await page.goto('/sign-in');
  await page.getByLabel('E-mail').fill(LEAD.email);
  await page.getByLabel('Password').fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await expect(page.getByRole('heading', { level: 1, name: LEAD.landing })).toBeVisible();

  const jobs = await page.request.get('/api/jobs?pageSize=25');
  expect(jobs.status()).toBe(200);
  const jobId = ((await jobs.json()) as { jobs: { id: number }[] }).jobs[0]!.id;
  const before = await (await page.request.get(`/api/jobs/${jobId}`)).json();
  const kept = sessionCookie(await context.cookies());
  expect(kept?.value).toBeTruthy();

  await page.getByRole('button', { name: 'Sign out' }).click();
  await expect(page).toHaveURL(/\/sign-in/);
  await expect(page.getByRole('heading', { level: 1, name: 'Sign in' })).toBeVisible();
  await context.close();

  // The old cookie, replayed as an attacker who copied it would.
  const replay = await playwrightRequest.newContext({
    baseURL,
    storageState: { cookies: [kept!], origins: [] },
  });
  const me = await replay.get('/api/me');
  expect(me.status()).toBe(401);
  expect(me.headers()['content-type']).toContain('application/problem+json');

  const patch = await replay.patch(`/api/jobs/${jobId}`, {
    data: { findings: 'written with an ended session' },
    headers: { origin: baseURL! },
  });
  expect(patch.status()).toBe(401);

  const session = await replay.get('/api/auth/session');
  expect(session.status()).toBe(200);
  expect(await session.json()).toEqual({});
  const setCookies = session.headersArray().filter((h) => h.name.toLowerCase() === 'set-cookie');
  for (const { value } of setCookies.filter((h) => h.value.includes('session-token'))) {
    // Only a clearing cookie, never a fresh session.
    expect(value).toMatch(/session-token=;/);
  }
  const page2 = await replay.get('/', { maxRedirects: 0 });
  expect([302, 303, 307]).toContain(page2.status());
  expect(page2.headers()['location']).toContain('/sign-in');
  await replay.dispose();

  // Nothing was saved: the lead, signed in again, sees the job as it was.
  const again = await browser.newContext();
  const page3 = await again.newPage();
  await page3.goto('/sign-in');
  await page3.getByLabel('E-mail').fill(LEAD.email);
  await page3.getByLabel('Password').fill(DEMO_PASSWORD);
  await page3.getByRole('button', { name: 'Sign in' }).click();
  await expect(page3.getByRole('heading', { level: 1, name: LEAD.landing })).toBeVisible();
  const after = await (await page3.request.get(`/api/jobs/${jobId}`)).json();
  expect(after.findings).toEqual(before.findings);
  await again.close();
});

test('anyone – 50 wrong passwords block the account, and then the right one is refused', async ({
  browser,
  baseURL,
}) => {
  const api = await playwrightRequest.newContext({
    baseURL,
    extraHTTPHeaders: { ...ATTACKER, origin: baseURL! },
  });
  const attempt = async (password: string) => {
    const { csrfToken } = (await (await api.get('/api/auth/csrf')).json()) as {
      csrfToken: string;
    };
    const response = await api.post('/api/auth/callback/credentials', {
      form: { csrfToken, email: BLOCKED, password, json: 'true' },
    });
    const { url } = (await response.json()) as { url: string };
    return { status: response.status(), error: new URL(url).searchParams.get('error') };
  };
  const answers = [];
  for (let i = 0; i < 49; i++) answers.push(await attempt(`wrong-${i}`));
  expect(answers.every((a) => a.status === 401)).toBe(true);
  expect(answers.slice(0, 4).map((a) => a.error)).toEqual(Array(4).fill('CredentialsSignin'));
  expect(answers.slice(4).every((a) => a.error?.startsWith('TooManyAttempts:'))).toBe(true);
  await api.dispose();

  // The 50th through the form, then the right password: both refused with the wait.
  const context = await browser.newContext({ extraHTTPHeaders: ATTACKER });
  const page = await context.newPage();
  await page.goto('/sign-in');
  const alert = page.getByRole('alert').filter({ hasText: /\S/ });
  const message = 'Too many failed sign-ins. Wait 15 minutes, then try again.';
  await page.getByLabel('E-mail').fill(BLOCKED);
  await page.getByLabel('Password').fill('wrong-49');
  await page.getByRole('button', { name: 'Sign in' }).click();
  await expect(alert).toHaveText(message);
  await page.getByLabel('Password').fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await expect(alert).toHaveText(message);
  await expect(page).toHaveURL(/\/sign-in/);
  await page.screenshot({ path: screenshotPath('sign-in-throttled'), fullPage: true });
  await context.close();

  // The owner sees the block, with the e-mail and the address, under Settings.
  const owner = await browser.newContext({ storageState: storageState('owner') });
  const settings = await owner.newPage();
  await settings.goto('/settings');
  const blocks = settings.getByRole('table', { name: 'Sign-in blocks' });
  await expect(
    blocks.getByRole('row').filter({ hasText: BLOCKED }).filter({ hasText: '203.0.113.50' }),
  ).toHaveCount(1);
  await owner.close();
});
