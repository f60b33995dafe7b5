import { expect, test as setup } from '@playwright/test';
import { ACCOUNTS, DEMO_PASSWORD, storageState, type AccountName } from './accounts';

// Each role signs in once through the sign-in page; the specs reuse the saved state.
for (const name of Object.keys(ACCOUNTS) as AccountName[]) {
  setup(`sign in as ${name}`, async ({ page }) => {
    const account = ACCOUNTS[name];
    await page.goto('/sign-in');
    await page.getByLabel('E-mail').fill(account.email);
    await page.getByLabel('Password').fill(DEMO_PASSWORD);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await expect(page.getByRole('heading', { level: 1, name: account.landing })).toBeVisible();
    await page.context().storageState({ path: storageState(name) });
  });
}
