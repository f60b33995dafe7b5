import { expect, test } from '@playwright/test';
import { screenshotPath, storageState } from './accounts';
import { expectAccessible } from './axe';
import { NEXT_YEAR } from './clock';

// Dates in the calendar year after the seed's "today": one that does not exist, one far ahead.
const NOT_A_DATE = `${NEXT_YEAR}-02-30`;
const FAR_AHEAD = `${NEXT_YEAR}-12-27`;

test.use({ storageState: storageState('owner') });

test('owner – edits a shop’s opening hours: a wrong span is named, a saved change recomputes the finished jobs’ turnaround', async ({
  page,
}) => {
  await page.goto('/settings');
  await page
    .getByRole('main')
    .getByRole('link', { name: 'Hours and closed dates of Marram Point' })
    .click();
  await expect(
    page.getByRole('heading', { level: 1, name: 'Marram Point: opening hours' }),
  ).toBeVisible();
  await expectAccessible(page);
  // Marram Point keeps Monday closed and splits its weekdays around lunch.
  await expect(page.getByLabel('Monday', { exact: true })).toHaveValue('');
  const tuesday = page.getByLabel('Tuesday', { exact: true });
  const before = await tuesday.inputValue();
  expect(before).toMatch(/^\d\d:\d\d–\d\d:\d\d/);
  const dates = page.getByRole('textbox', { name: 'Closed dates' });
  const closedBefore = await dates.inputValue();
  await page.screenshot({ path: screenshotPath('shop-hours-1280x900'), fullPage: true });

  // A closing time before the opening time is refused before anything is sent.
  await tuesday.fill('17:00–09:00');
  await page.getByRole('button', { name: 'Save the opening hours' }).click();
  await expect(tuesday).toHaveAttribute('aria-invalid', 'true');
  await expect(
    page.getByText('17:00–09:00: Closing time must be after opening time.'),
  ).toBeVisible();
  await tuesday.fill(before);

  // A date that does not exist passes the form's shape check; the server refuses it, by name.
  await dates.fill(`${closedBefore}\n${NOT_A_DATE}`.trim());
  await page.getByRole('button', { name: 'Save the opening hours' }).click();
  await expect(page.getByText(`${NOT_A_DATE}: Not a calendar date`)).toBeVisible();
  await expect(dates).toHaveAttribute('aria-invalid', 'true');

  // A closed day far ahead changes no finished job's turnaround, but every one is computed again.
  await dates.fill(`${closedBefore}\n${FAR_AHEAD}`.trim());
  await page.getByRole('button', { name: 'Save the opening hours' }).click();
  const done = page.getByText(
    /^Saved\. Turnaround computed again for [\d,]+ finished jobs; 0 changed\.$/,
  );
  await expect(done).toBeVisible();
  const recomputed = Number((await done.innerText()).match(/for ([\d,]+)/)![1]!.replace(/,/g, ''));
  expect(recomputed).toBeGreaterThan(100);

  const api = (await (
    await page.request.get(page.url().replace('/settings/shops/', '/api/shops/') + '/calendar')
  ).json()) as { closedDates: string[] };
  expect(api.closedDates).toContain(FAR_AHEAD);

  // Put the dates back as they were.
  await page.reload();
  await dates.fill(closedBefore);
  await page.getByRole('button', { name: 'Save the opening hours' }).click();
  await expect(page.getByText(/^Saved\./)).toBeVisible();
  await expectAccessible(page);
});
