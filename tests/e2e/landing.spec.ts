import { expect, test } from '@playwright/test';
import { ACCOUNTS, screenshotPath, storageState, type AccountName } from './accounts';
import { expectAccessible } from './axe';

test.describe('landing pages', () => {
  for (const name of Object.keys(ACCOUNTS) as AccountName[]) {
    test.describe(() => {
      test.use({ storageState: storageState(name) });

      test(`${name} – lands on their own page with real figures`, async ({ page }) => {
        await page.goto('/');
        await expect(
          page.getByRole('heading', { level: 1, name: ACCOUNTS[name].landing }),
        ).toBeVisible();
        // Every landing page shows live counts from the database: at least one figure above zero.
        const figures = await page.locator('dd.text-3xl').allInnerTexts();
        expect(figures.length).toBeGreaterThan(0);
        expect(figures.some((f) => Number(f.replace(/,/g, '')) > 0)).toBe(true);
        await expectAccessible(page);
        await page.screenshot({ path: screenshotPath(`landing-${name}`), fullPage: true });
      });
    });
  }

  test.describe(() => {
    test.use({ storageState: storageState('managerNorth') });
    test('regional manager – sees only the shops of their region', async ({ page }) => {
      await page.goto('/');
      const table = page.getByRole('table', { name: 'Shops in your view with their open work' });
      await expect(table.getByRole('link', { name: 'Marram Point' })).toBeVisible();
      await expect(table.getByRole('link', { name: 'Ternhollow Lake' })).toBeVisible();
      await expect(table.getByRole('link', { name: 'Fennel Cove' })).toHaveCount(0);
      await expect(table.locator('tbody tr')).toHaveCount(4);
    });
  });

  test.describe(() => {
    test.use({ storageState: storageState('owner') });
    test('owner – opens a shop page from the network table', async ({ page }) => {
      await page.goto('/');
      await page.getByRole('link', { name: 'Skerry Wharf' }).click();
      await expect(page.getByRole('heading', { level: 1, name: 'Skerry Wharf' })).toBeVisible();
      await expect(page.getByRole('table', { name: /Open jobs at Skerry Wharf/ })).toBeVisible();
      await expectAccessible(page);
      await page.screenshot({ path: screenshotPath('shop-page-owner'), fullPage: true });
    });

    test('owner – sees the people of the network in settings', async ({ page }) => {
      await page.goto('/settings');
      await expect(page.getByRole('heading', { level: 1, name: 'Settings' })).toBeVisible();
      await page.getByRole('main').getByRole('link', { name: 'People', exact: true }).click();
      await expect(page.getByRole('heading', { level: 1, name: 'People' })).toBeVisible();
      const people = page.getByRole('table', { name: 'People' });
      await expect(people.getByRole('cell', { name: 'auditor@saltwick.test' })).toBeVisible();
      expect(await people.locator('tbody tr').count()).toBeGreaterThanOrEqual(20);
      await expectAccessible(page);
    });
  });
});
