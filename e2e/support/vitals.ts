import type { Page } from '@playwright/test';

// Layout shift and largest paint read in the page with PerformanceObserver, the way web.dev's
// web-vitals library defines them: CLS is the largest session window of layout shifts (shifts
// less than 1 s apart, the window at most 5 s long) that had no recent user input; LCP is the
// last largest-contentful-paint entry. Source: web.dev "Cumulative Layout Shift (CLS)" and
// "Largest Contentful Paint (LCP)"; thresholds "good" CLS <= 0.1, LCP <= 2.5 s (web.dev).

export const CLS_GOOD = 0.1;
export const LCP_GOOD_MS = 2500;

export interface Vitals {
  cls: number;
  lcpMs: number | null;
  shifts: { value: number; at: number; sources: string[] }[];
}

declare global {
  interface Window {
    __swVitals?: { shifts: { value: number; startTime: number; hadRecentInput: boolean; sources: string[] }[]; lcp: number | null };
  }
}

/**
 * Starts recording before any page script runs. Call once per page (or context) before the
 * first `goto`; every later navigation in that page records afresh.
 */
export async function watchVitals(page: Page): Promise<void> {
  await page.addInitScript(() => {
    const store: NonNullable<Window['__swVitals']> = { shifts: [], lcp: null };
    window.__swVitals = store;
    const describe = (node: Node | null | undefined): string => {
      if (!node || !(node instanceof Element)) return '#text';
      const id = node.id ? `#${node.id}` : '';
      const cls = typeof node.className === 'string' && node.className ? `.${node.className.trim().split(/\s+/).slice(0, 2).join('.')}` : '';
      return `${node.tagName.toLowerCase()}${id}${cls}`;
    };
    try {
      new PerformanceObserver((list) => {
        for (const e of list.getEntries() as (PerformanceEntry & { value: number; hadRecentInput: boolean; sources?: { node?: Node }[] })[]) {
          store.shifts.push({ value: e.value, startTime: e.startTime, hadRecentInput: e.hadRecentInput, sources: (e.sources ?? []).map((s) => describe(s.node)) });
        }
      }).observe({ type: 'layout-shift', buffered: true });
      new PerformanceObserver((list) => {
        const entries = list.getEntries();
        const last = entries[entries.length - 1];
        if (last) store.lcp = last.startTime;
      }).observe({ type: 'largest-contentful-paint', buffered: true });
    } catch {
      // A browser without these entry types reports nothing; readVitals then reads zero.
    }
  });
}

/** CLS as the largest session window (gap < 1 s, window <= 5 s), per web.dev's definition. */
export function sessionWindowCls(shifts: { value: number; startTime: number; hadRecentInput: boolean }[]): number {
  let worst = 0;
  let current = 0;
  let first = -Infinity;
  let prev = -Infinity;
  for (const s of shifts) {
    if (s.hadRecentInput) continue;
    if (s.startTime - prev < 1000 && s.startTime - first < 5000) {
      current += s.value;
    } else {
      current = s.value;
      first = s.startTime;
    }
    prev = s.startTime;
    worst = Math.max(worst, current);
  }
  return worst;
}

/**
 * Reads what was recorded so far. Give the page a moment to settle first (wait for the
 * content the test cares about), since late shifts count too.
 */
export async function readVitals(page: Page): Promise<Vitals> {
  // Let pending frames deliver their entries to the observers.
  await page.evaluate(() => new Promise<void>((r) => requestAnimationFrame(() => requestAnimationFrame(() => r()))));
  const raw = await page.evaluate(() => window.__swVitals ?? { shifts: [], lcp: null });
  return {
    cls: sessionWindowCls(raw.shifts),
    lcpMs: raw.lcp,
    shifts: raw.shifts.filter((s) => !s.hadRecentInput).map((s) => ({ value: s.value, at: Math.round(s.startTime), sources: s.sources })),
  };
}
