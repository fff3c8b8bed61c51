import AxeBuilder from '@axe-core/playwright';
import type { Page } from '@playwright/test';
import { readVitals } from './vitals';

// WCAG 2.1 level A and AA, the rule tags axe-core uses for them (axe-core API documentation).
export const WCAG21_AA = ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'];

export interface PageResult {
  role: string;
  path: string;
  title: string;
  lcpMs: number | null;
  cls: number;
  shifts: { value: number; at: number; sources: string[] }[];
  violations: { id: string; impact: string | null; help: string; targets: string[] }[];
  /** The line under the page's heading that says what the page is for; null when there is none. */
  helpLine: string | null;
}

/** The first plain paragraph among the few elements after the page's main heading. */
function readHelpLine(page: Page): Promise<string | null> {
  return page.evaluate(() => {
    const h1 = document.querySelector('main h1') ?? document.querySelector('h1');
    let el = h1?.nextElementSibling ?? null;
    for (let i = 0; el && i < 4; i++, el = el.nextElementSibling) {
      const text = el.textContent?.replace(/\s+/g, ' ').trim() ?? '';
      if (el.tagName === 'P' && !el.getAttribute('role') && text.length >= 20) return text;
    }
    return null;
  });
}

/**
 * Opens a page with a full load (so its largest paint is its own), waits until it has settled,
 * then reads its vitals and runs axe over it.
 */
export async function auditPage(page: Page, role: string, path: string): Promise<PageResult> {
  await page.goto(path, { waitUntil: 'load' });
  await page.waitForLoadState('networkidle', { timeout: 10_000 }).catch(() => undefined);
  await page
    .locator('h1')
    .first()
    .waitFor({ state: 'visible', timeout: 10_000 })
    .catch(() => undefined);
  // Late shifts and late paints count: give the page a beat after its data arrived.
  await page.waitForTimeout(500);
  const vitals = await readVitals(page);
  const axe = await new AxeBuilder({ page }).withTags(WCAG21_AA).analyze();
  return {
    role,
    path,
    title: await page.title(),
    lcpMs: vitals.lcpMs === null ? null : Math.round(vitals.lcpMs),
    cls: Number(vitals.cls.toFixed(4)),
    helpLine: await readHelpLine(page),
    shifts: vitals.shifts,
    violations: axe.violations.map((v) => ({
      id: v.id,
      impact: v.impact ?? null,
      help: v.help,
      targets: v.nodes.slice(0, 5).map((n) => `${n.target.join(' ')}${n.failureSummary ? ` — ${n.failureSummary.replace(/\s+/g, ' ').slice(0, 200)}` : ''}`),
    })),
  };
}
