import { expect, test } from '@playwright/test';
import { screenshotPath, storageState } from './accounts';
import { expectAccessible } from './axe';
import { DAY, SEED_NOW } from './clock';

// The owner opens a shop in a time zone the network did not have. It is in the network view and
// the month close from the month it opened (the earlier months, which other specs read, stay as
// they were), with no jobs and no flags, and its lead checks a reel in at once.

const SHOP = 'Juniper Flats';
const LEAD = 'fenwick.oduya-marsh@saltwick.test';
const PASSWORD = 'brass-bail-spool-tide';
const month = SEED_NOW.toISOString().slice(0, 7);
const today = SEED_NOW.toISOString().slice(0, 10);

test.use({ storageState: storageState('owner') });

test('owner – opens a shop in a new time zone; it is in the network view with no jobs and no flags, takes a check-in, and its month-close row follows', async ({
  page,
  browser,
  baseURL,
}) => {
  await page.goto('/settings/shops');
  await expect(page.getByRole('heading', { level: 1, name: 'Shops and regions' })).toBeVisible();
  await expectAccessible(page);

  // A zone the server does not know is refused by name, before anything is written.
  const form = page.getByRole('region', { name: 'Open a shop' });
  await form.getByLabel('Name').fill(SHOP);
  await form.getByLabel('Region').selectOption({ label: 'North Shore' });
  await form.getByLabel('Time zone').fill('America/Nowhere');
  await form.getByLabel('Posted labour rate per hour').fill('68.00');
  await form.getByLabel('Royalty rate (%)').fill('6');
  for (const day of ['Tuesday', 'Wednesday', 'Thursday', 'Friday'])
    await form.getByLabel(day, { exact: true }).fill('09:00–17:00');
  await form.getByLabel('Saturday', { exact: true }).fill('09:00–13:00');
  await form.getByLabel('Closed dates').fill('2026-12-25');
  await form.getByRole('button', { name: 'Open the shop' }).click();
  await expect(form.getByText('Not a time zone this server knows')).toBeVisible();
  await form.getByLabel('Time zone').fill('America/Denver');
  await form.getByRole('button', { name: 'Open the shop' }).click();
  await expect(form.getByText(`${SHOP} is open.`)).toBeVisible();
  const row = page
    .getByRole('table', { name: 'Shops' })
    .getByRole('row', { name: new RegExp(SHOP) });
  await expect(row).toContainText('America/Denver');
  await expect(row).toContainText('68.00 USD');
  await expect(row).toContainText('6%');
  await expect(row).toContainText('Open');
  await page.screenshot({ path: screenshotPath('shops-settings-1280x900'), fullPage: true });

  // In the network view of the month it opened: no jobs, no flag.
  await page.goto(`/network?from=${month}-01&to=${today}`);
  const network = page
    .getByRole('table', { name: /^Shops side by side/ })
    .getByRole('row', { name: new RegExp(SHOP) });
  await expect(network).toBeVisible();
  await expect(network).not.toContainText(/out of line|on watch/i);
  const shopId = (
    (await (await page.request.get('/api/shops')).json()) as {
      shops: { id: number; name: string }[];
    }
  ).shops.find((s) => s.name === SHOP)!.id;

  // Its lead, invited by the owner, checks a reel in.
  const invite = await page.request.post('/api/users', {
    data: { name: 'Fenwick Oduya-Marsh', email: LEAD, role: 'shop_lead', shopId },
    headers: { origin: baseURL! },
  });
  expect(invite.status()).toBe(201);
  let link = '';
  await expect
    .poll(
      async () => {
        const caught = (await (
          await page.request.get(`/api/dev/mail?to=${encodeURIComponent(LEAD)}`)
        ).json()) as { messages: { text: string }[] };
        link =
          /\/set-password\?token=([A-Za-z0-9_-]{43})/.exec(caught.messages[0]?.text ?? '')?.[1] ??
          '';
        return link;
      },
      { timeout: 20_000 },
    )
    .not.toBe('');
  const context = await browser.newContext({ storageState: { cookies: [], origins: [] } });
  const lead = await context.newPage();
  const set = await lead.request.post('/api/auth/password-reset/confirm', {
    data: { token: link, password: PASSWORD },
    headers: { origin: baseURL! },
  });
  expect(set.status()).toBe(200);
  await lead.goto('/sign-in');
  await lead.getByLabel('E-mail').fill(LEAD);
  await lead.getByLabel('Password').fill(PASSWORD);
  await lead.getByRole('button', { name: 'Sign in' }).click();
  await expect(lead.getByRole('heading', { level: 1, name: `${SHOP} today` })).toBeVisible();
  const checkIn = await lead.request.post('/api/jobs', {
    data: {
      customer: { name: 'Marguerite Ellison-Fray', reminderConsent: false },
      reel: {
        kind: 'baitcasting',
        maker: 'Tidewake',
        model: 'Castline',
        useProfile: 'light',
        water: 'fresh',
      },
      serviceType: 'tune_up',
      promisedOn: new Date(SEED_NOW.getTime() + 7 * DAY).toISOString().slice(0, 10),
    },
    headers: { origin: baseURL! },
  });
  expect(checkIn.status(), await checkIn.text()).toBe(201);
  await context.close();

  // A new royalty rate from next month is dated; this month keeps the rate the shop opened with.
  const next = new Date(Date.UTC(SEED_NOW.getUTCFullYear(), SEED_NOW.getUTCMonth() + 1, 1))
    .toISOString()
    .slice(0, 7);
  await page.goto(`/settings/shops/${shopId}`);
  await expect(
    page.getByRole('heading', { level: 1, name: `${SHOP}: opening hours` }),
  ).toBeVisible();
  await page.getByLabel('Royalty rate (%)').fill('7');
  await page.getByLabel('New royalty rate from (month)').fill(next);
  await page.getByRole('button', { name: 'Save the details' }).click();
  await expect(page.getByText('Saved.', { exact: true })).toBeVisible();
  const rates = page.getByRole('table', { name: 'Royalty rates by month' });
  await expect(rates.getByRole('row', { name: 'Earlier months 6%' })).toBeVisible();
  await expect(rates.getByRole('row', { name: `${next} 7%` })).toBeVisible();
  await expectAccessible(page);
  const royaltyIn = async (m: string) =>
    (
      (await (await page.request.get(`/api/month-close/${m}`)).json()) as {
        shops: { shop: { name: string }; royaltyRateBp: number | null }[];
      }
    ).shops.find((r) => r.shop.name === SHOP)?.royaltyRateBp;
  expect(await royaltyIn(month)).toBe(600);
  expect(await royaltyIn(next)).toBe(700);

  // The month close of that month has its row.
  await page.goto(`/month-close?month=${month}`);
  await expect(page.getByRole('heading', { level: 1, name: 'Month close' })).toBeVisible();
  await expect(
    page
      .getByRole('region', { name: 'Revenue and royalties per shop' })
      .getByRole('row', { name: new RegExp(SHOP) }),
  ).toBeVisible();
  await expectAccessible(page);
});
