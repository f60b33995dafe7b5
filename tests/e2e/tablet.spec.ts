import { expect, test, type Page } from '@playwright/test';
import { screenshotPath, storageState } from './accounts';
import { expectAccessible } from './axe';

// The bench on a tablet, held either way: nothing scrolls sideways, the controls a technician
// touches are at least 44 px tall (WCAG 2.2 target size, enhanced: 2.5.5), and the timer and the
// checklist are there without hunting.
const SIZES = [
  { name: 'portrait', width: 768, height: 1024 },
  { name: 'landscape', width: 1024, height: 768 },
] as const;

/** Controls in the page's main area smaller than 44 px in height, named for the failure message. */
async function smallTargets(page: Page) {
  return page.locator('main').evaluate((main) => {
    const controls = main.querySelectorAll<HTMLElement>(
      'button, select, input:not([type=checkbox]):not([type=radio]):not([type=hidden]), textarea, label:has(input[type=checkbox]), label:has(input[type=radio])',
    );
    return (
      Array.from(controls)
        .filter((el) => el.offsetParent !== null)
        // A visually hidden input (a file picker behind its styled label) is not the target.
        .filter((el) => el.getBoundingClientRect().height > 2)
        .filter((el) => el.getBoundingClientRect().height < 44)
        .map(
          (el) =>
            `${el.tagName.toLowerCase()} “${(el.textContent ?? '').trim().slice(0, 40)}” ${Math.round(el.getBoundingClientRect().height)} px`,
        )
    );
  });
}

async function expectNoSidewaysScroll(page: Page) {
  const { scroll, width } = await page.evaluate(() => ({
    scroll: document.documentElement.scrollWidth,
    width: window.innerWidth,
  }));
  expect(scroll, 'the page scrolls sideways').toBeLessThanOrEqual(width);
}

test.describe('technician on a tablet', () => {
  test.use({ storageState: storageState('techMarram') });

  for (const size of SIZES) {
    test(`technician – works the bench on a tablet in ${size.name}`, async ({ page }) => {
      await page.setViewportSize({ width: size.width, height: size.height });

      await page.goto('/bench');
      await expect(page.getByRole('heading', { level: 1, name: 'Bench' })).toBeVisible();
      await expect(page.locator('main table tbody tr').first()).toBeVisible();
      await expectNoSidewaysScroll(page);
      expect(await smallTargets(page)).toEqual([]);
      await page.screenshot({ path: screenshotPath(`tablet-bench-${size.name}`) });

      // Below 1024 px the sections fold into a button that opens them.
      const sections = page.getByRole('button', { name: 'Sections' });
      if (size.width < 1024) {
        await expect(page.getByRole('navigation', { name: 'Sections' })).toBeHidden();
        await sections.click();
        await expect(sections).toHaveAttribute('aria-expanded', 'true');
        await expect(
          page.getByRole('navigation', { name: 'Sections' }).getByRole('link', { name: 'Bench' }),
        ).toBeVisible();
        await sections.click();
      } else {
        await expect(sections).toBeHidden();
      }

      await page.goto('/bench/new');
      await expect(page.getByRole('heading', { level: 1, name: 'Check a reel in' })).toBeVisible();
      await expectNoSidewaysScroll(page);
      expect(await smallTargets(page)).toEqual([]);
      await expectAccessible(page);
      await page.screenshot({
        path: screenshotPath(`tablet-check-in-${size.name}`),
        fullPage: true,
      });

      // An open job of the shop: the timer and the checklist within reach.
      await page.goto('/bench');
      await page.locator('main table tbody tr a[href^="/bench/jobs/"]').first().click();
      await expect(page).toHaveURL(/\/bench\/jobs\/\d+$/);
      await expect(page.getByRole('region', { name: 'Service checklist' })).toBeVisible();
      await expectNoSidewaysScroll(page);
      expect(await smallTargets(page)).toEqual([]);
      await expectAccessible(page);
      await page.screenshot({ path: screenshotPath(`tablet-job-${size.name}`), fullPage: true });
    });
  }
});
