import { expect, test } from '@playwright/test';
import { APP_URL } from './support/env';

test('the shell renders in Nunito and fetches nothing from outside its origin', async ({ page }) => {
  const origin = new URL(APP_URL).origin;
  const foreign: string[] = [];
  page.on('request', (req) => {
    const url = req.url();
    if (!url.startsWith(origin) && !url.startsWith('data:') && !url.startsWith('blob:')) foreign.push(url);
  });

  await page.goto('/');
  await expect(page.getByRole('heading', { level: 1 })).toBeVisible();
  await expect(page.getByRole('link', { name: 'Seasonwell home' })).toBeVisible();

  const font = await page.evaluate(async () => {
    await document.fonts.ready;
    const h1 = document.querySelector('h1')!;
    const loaded = [...document.fonts].filter((f) => f.family.replace(/["']/g, '') === 'Nunito' && f.status === 'loaded').length;
    return { family: getComputedStyle(h1).fontFamily, loaded, check: document.fonts.check('800 16px Nunito') };
  });
  expect(font.family).toMatch(/^Nunito/);
  expect(font.loaded).toBeGreaterThan(0);
  expect(font.check).toBe(true);

  // The emergency advice comes before any form.
  await expect(page.getByRole('note')).toContainText('Leave the building');

  await page.goto('/no-such-page');
  await expect(page.getByRole('heading', { name: 'We could not find that page' })).toBeVisible();
  expect(foreign).toEqual([]);
});

test('a phone-sized screen does not scroll sideways', async ({ page }) => {
  await page.setViewportSize({ width: 360, height: 740 });
  await page.goto('/');
  await expect(page.getByRole('heading', { level: 1 })).toBeVisible();
  const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
  expect(overflow).toBeLessThanOrEqual(0);
});
