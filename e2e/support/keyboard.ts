import { expect, type Locator, type Page } from '@playwright/test';

/**
 * Whether keyboard focus is drawn: the focused element, or the control that wraps it (a text
 * field, radio or checkbox, whose native input is not what is seen), shows an outline at least
 * 2 px wide or a box shadow (WCAG 2.1 SC 2.4.7 Focus Visible).
 */
export async function focusIndicator(page: Page): Promise<{ tag: string; visible: boolean; how: string }> {
  return page.evaluate(() => {
    const el = document.activeElement as HTMLElement | null;
    if (!el || el === document.body) return { tag: 'body', visible: true, how: 'nothing focused' };
    const shown =
      el.closest('.mat-mdc-form-field')?.querySelector<HTMLElement>('.mat-mdc-text-field-wrapper') ??
      el.closest('.mat-mdc-radio-button')?.querySelector<HTMLElement>('.mdc-radio') ??
      el.closest('.mat-mdc-checkbox')?.querySelector<HTMLElement>('.mdc-checkbox') ??
      el;
    const s = getComputedStyle(shown);
    const outline = s.outlineStyle !== 'none' && parseFloat(s.outlineWidth) >= 2 && !/rgba\(.*,\s*0\)$/.test(s.outlineColor);
    const shadow = s.boxShadow !== 'none';
    const tag = `${el.tagName.toLowerCase()}${el.getAttribute('aria-label') ? `[${el.getAttribute('aria-label')}]` : ''} ${(el.textContent ?? '').trim().slice(0, 40)}`;
    return { tag, visible: outline || shadow, how: outline ? `outline ${s.outlineWidth} ${s.outlineStyle}` : shadow ? `box-shadow ${s.boxShadow}` : 'none' };
  });
}

/** Presses Tab (or Shift+Tab) until `target` has focus, checking at each stop that focus is drawn. */
export async function tabTo(page: Page, target: Locator, { back = false, max = 80 } = {}): Promise<void> {
  await target.waitFor({ state: 'visible' });
  const handle = await target.elementHandle();
  for (let i = 0; i < max; i++) {
    await page.keyboard.press(back ? 'Shift+Tab' : 'Tab');
    const f = await focusIndicator(page);
    expect(f.visible, `focus is drawn on ${f.tag}`).toBe(true);
    if (await handle!.evaluate((el) => el === document.activeElement || el.contains(document.activeElement))) return;
  }
  throw new Error(`${back ? 'Shift+Tab' : 'Tab'} did not reach ${target} within ${max} presses`);
}

/** Tabs to a field and types into it (Tab into a text field selects what it holds). */
export async function tabAndType(page: Page, target: Locator, text: string, opts: { back?: boolean } = {}): Promise<void> {
  await tabTo(page, target, opts);
  await page.keyboard.type(text);
}

/** Opens the account menu from the keyboard, closes it again and checks focus went back to it. */
export async function accountMenuReturnsFocus(page: Page): Promise<void> {
  const trigger = page.getByRole('button', { name: 'Account menu' });
  await tabTo(page, trigger);
  await page.keyboard.press('Enter');
  const menu = page.getByRole('menu');
  await expect(menu).toBeVisible();
  await expect(menu.getByRole('menuitem').first()).toBeFocused();
  expect((await focusIndicator(page)).visible, 'focus is drawn in the menu').toBe(true);
  await page.keyboard.press('Escape');
  await expect(menu).toBeHidden();
  await expect(trigger).toBeFocused();
}
