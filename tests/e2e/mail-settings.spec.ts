import { expect, test } from '@playwright/test';
import { storageState } from './accounts';
import { expectAccessible } from './axe';

test.use({ storageState: storageState('owner') });

test('owner – turns the weekly reminder run off and on, and sees that no mail is undelivered', async ({
  page,
}) => {
  await page.goto('/settings');
  const panel = page.getByRole('region', { name: 'Mail and reminders' });
  const weekly = panel.getByRole('checkbox', {
    name: 'Send each shop’s service reminders on Monday morning',
  });
  await expect(weekly).toBeChecked();
  await expect(panel.getByText('Every message was delivered.')).toBeVisible();
  await expectAccessible(page);

  await weekly.uncheck();
  await expect(page.getByText('Weekly reminders are off.')).toBeVisible();
  await page.reload();
  await expect(weekly).not.toBeChecked();
  await weekly.check();
  await expect(page.getByText('Weekly reminders are on.')).toBeVisible();
  await page.reload();
  await expect(weekly).toBeChecked();
});
