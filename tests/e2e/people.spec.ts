import { expect, test, type APIRequestContext, type Browser, type Page } from '@playwright/test';
import { screenshotPath, storageState } from './accounts';
import { expectAccessible } from './axe';

// The owner runs the network's people: an invitation caught by the local SMTP catcher, a move
// between shops and a deactivation, each felt by the technician at their next request; and the
// forgotten-password link, which works once.

const NEW_PASSWORD = 'brass-bail-spool-tide';

/** The set-password link of the latest message the catcher received for `to`. */
async function caughtLink(owner: APIRequestContext, to: string, after = 0): Promise<string> {
  let link = '';
  await expect
    .poll(
      async () => {
        const res = await owner.get(`/api/dev/mail?to=${encodeURIComponent(to)}`);
        const { messages } = (await res.json()) as { messages: { text: string }[] };
        // Newest first.
        if (messages.length <= after) return '';
        link =
          /https?:\/\/\S+\/set-password\?token=[A-Za-z0-9_-]{43}/.exec(messages[0]!.text)?.[0] ??
          '';
        return link;
      },
      { timeout: 20_000 },
    )
    .not.toBe('');
  return link;
}

async function caughtCount(owner: APIRequestContext, to: string): Promise<number> {
  const res = await owner.get(`/api/dev/mail?to=${encodeURIComponent(to)}`);
  return ((await res.json()) as { messages: unknown[] }).messages.length;
}

async function signIn(page: Page, email: string, password: string) {
  await page.goto('/sign-in');
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
}

const shopNames = async (page: Page) =>
  (
    (await (await page.request.get('/api/shops')).json()) as { shops: { name: string }[] }
  ).shops.map((s) => s.name);

async function newPage(browser: Browser) {
  const context = await browser.newContext({ storageState: { cookies: [], origins: [] } });
  return { context, page: await context.newPage() };
}

test.describe('people', () => {
  test.use({ storageState: storageState('owner') });

  test('owner – invites a technician to Marram Point, moves them to Fennel Cove and deactivates them; each change reaches their next request', async ({
    page,
    browser,
  }) => {
    const email = 'nerys.quillfeather@saltwick.test';
    await page.goto('/settings/people');
    await expect(page.getByRole('heading', { level: 1, name: 'People' })).toBeVisible();
    // The seed's pending invitation and former technician are on the list.
    const accounts = page.getByRole('table', { name: 'People' });
    await expect(accounts.getByRole('row', { name: /Hollis Trevanion/ })).toContainText('Invited');
    await expect(accounts.getByRole('row', { name: /Bramwell Stonehouse/ })).toContainText(
      'Deactivated',
    );
    await expectAccessible(page);

    await page.getByLabel('Name').fill('Nerys Quillfeather');
    await page.getByLabel('E-mail').fill(email);
    await page.getByLabel('Role').selectOption({ label: 'Technician' });
    await page.getByLabel('Shop').selectOption({ label: 'Marram Point' });
    await page.getByRole('button', { name: 'Send the invitation' }).click();
    await expect(
      page.getByText(`Invitation sent to Nerys Quillfeather at ${email}.`),
    ).toBeVisible();
    await expect(accounts.getByRole('row', { name: /Nerys Quillfeather/ })).toContainText(
      'Invited',
    );
    await page.screenshot({ path: screenshotPath('people-1280x900'), fullPage: true });

    // The invitation is caught; its link sets the password, once.
    const link = await caughtLink(page.request, email);
    const tech = await newPage(browser);
    await tech.page.goto(link);
    await expect(
      tech.page.getByRole('heading', { level: 1, name: 'Welcome, Nerys Quillfeather' }),
    ).toBeVisible();
    await expectAccessible(tech.page);
    await tech.page.getByLabel('New password').fill(NEW_PASSWORD);
    await tech.page.getByLabel('The same password again').fill(NEW_PASSWORD);
    await tech.page.getByRole('button', { name: 'Save the password' }).click();
    await expect(tech.page.getByText('Your password is set.')).toBeVisible();
    await tech.page.getByRole('link', { name: 'Sign in' }).click();
    await signIn(tech.page, email, NEW_PASSWORD);
    await expect(tech.page.getByRole('heading', { level: 1, name: 'Your bench' })).toBeVisible();
    expect(await shopNames(tech.page)).toEqual(['Marram Point']);

    // The owner moves them to Fennel Cove: their session ends; signed in again, they see Fennel Cove.
    await accounts.getByRole('link', { name: 'Nerys Quillfeather' }).click();
    await expect(page.getByRole('heading', { level: 1, name: 'Nerys Quillfeather' })).toBeVisible();
    await page.getByLabel('Shop').selectOption({ label: 'Fennel Cove' });
    await page.getByRole('button', { name: 'Save the changes' }).click();
    await expect(page.getByText('Saved.', { exact: true })).toBeVisible();
    const history = page.getByRole('table', { name: 'History of Nerys Quillfeather' });
    await expect(history).toContainText('Shop: Marram Point → Fennel Cove');
    await expect(history).toContainText('Set their password from the invitation');
    await expect(history).toContainText('Invited');
    await expectAccessible(page);

    expect((await tech.page.request.get('/api/me')).status()).toBe(401);
    await signIn(tech.page, email, NEW_PASSWORD);
    await expect(tech.page.getByRole('heading', { level: 1, name: 'Your bench' })).toBeVisible();
    expect(await shopNames(tech.page)).toEqual(['Fennel Cove']);

    // Deactivated: the open session is refused at the next request, and so is a new sign-in.
    await page.getByRole('button', { name: 'Deactivate Nerys Quillfeather' }).click();
    await expect(
      page.getByText('Deactivated: they are signed out and can no longer sign in.'),
    ).toBeVisible();
    expect((await tech.page.request.get('/api/me')).status()).toBe(401);
    await tech.page.goto('/bench');
    await expect(tech.page).toHaveURL(/\/sign-in/);
    await signIn(tech.page, email, NEW_PASSWORD);
    await expect(tech.page.getByRole('alert')).toBeVisible();
    await expect(tech.page).toHaveURL(/\/sign-in/);
    await tech.context.close();
  });

  test('owner – the last active owner cannot deactivate themselves (409)', async ({
    page,
    baseURL,
  }) => {
    const me = (await (await page.request.get('/api/me')).json()) as { id: number };
    const res = await page.request.patch(`/api/users/${me.id}`, {
      data: { active: false },
      headers: { origin: baseURL! },
    });
    expect(res.status()).toBe(409);
    expect(res.headers()['content-type']).toContain('application/problem+json');
  });
});

test.describe('forgotten password', () => {
  test.use({ storageState: storageState('owner') });

  test('anyone – an existing and a missing address get the same screen; the caught link resets the password once', async ({
    page: owner,
    browser,
    baseURL,
  }) => {
    // An account no other spec signs in with: its new password ends only its own sessions.
    const email = 'tech3.saltwick@saltwick.test';
    const before = await caughtCount(owner.request, email);
    const { context, page } = await newPage(browser);

    const ask = async (address: string) => {
      await page.goto('/sign-in');
      await page.getByRole('link', { name: 'Forgot your password?' }).click();
      await expect(
        page.getByRole('heading', { level: 1, name: 'Forgot your password?' }),
      ).toBeVisible();
      await page.getByLabel('E-mail').fill(address);
      await page.getByRole('button', { name: 'Send me a link' }).click();
      const answer = page.getByRole('status');
      await expect(answer).toContainText('Check your e-mail');
      return (await answer.innerText()).replace(address, '<address>');
    };
    const missing = await ask('nobody.here@saltwick.test');
    await expectAccessible(page);
    const existing = await ask(email);
    expect(existing).toBe(missing);

    const link = await caughtLink(owner.request, email, before);
    await page.goto(link);
    await expect(
      page.getByRole('heading', { level: 1, name: 'Choose a new password' }),
    ).toBeVisible();
    await expectAccessible(page);
    // A password from the common-password list is refused by name.
    await page.getByLabel('New password').fill('password1234');
    await page.getByLabel('The same password again').fill('password1234');
    await page.getByRole('button', { name: 'Save the password' }).click();
    await expect(page.getByText('This password is on a list of common passwords')).toBeVisible();
    await page.getByLabel('New password').fill(NEW_PASSWORD);
    await page.getByLabel('The same password again').fill(NEW_PASSWORD);
    await page.getByRole('button', { name: 'Save the password' }).click();
    await expect(page.getByText('Your password is set.')).toBeVisible();

    await page.goto(link);
    await expect(
      page.getByRole('heading', { level: 1, name: 'This link no longer works' }),
    ).toBeVisible();
    const replay = await page.request.post('/api/auth/password-reset/confirm', {
      data: { token: new URL(link).searchParams.get('token'), password: 'another-long-password' },
      headers: { origin: baseURL! },
    });
    expect(replay.status()).toBe(410);

    await signIn(page, email, NEW_PASSWORD);
    await expect(page.getByRole('heading', { level: 1, name: 'Your bench' })).toBeVisible();
    await context.close();
  });
});
