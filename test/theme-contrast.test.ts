import { compile } from 'sass';
import { fileURLToPath } from 'node:url';
import { beforeAll, describe, expect, it } from 'vitest';

// Text contrast in the built theme: the app's stylesheet compiled as Angular compiles it, the
// --mat-sys-* roles Material emits and our --sw-* tokens resolved, then every pairing of a status
// or body colour with a surface it sits on checked against WCAG 2.1 SC 1.4.3 (AA): 4.5:1 for text.

const ROOT = fileURLToPath(new URL('..', import.meta.url));

/** WCAG 2.1 relative luminance (Understanding SC 1.4.3, "relative luminance" definition). */
export function relativeLuminance(hex: string): number {
  const [r, g, b] = [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16) / 255).map((c) => (c <= 0.03928 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4));
  return 0.2126 * r! + 0.7152 * g! + 0.0722 * b!;
}

/** WCAG 2.1 contrast ratio, (L1 + 0.05) / (L2 + 0.05) with L1 the lighter. */
export function contrastRatio(a: string, b: string): number {
  const [hi, lo] = [relativeLuminance(a), relativeLuminance(b)].sort((x, y) => y - x);
  return (hi! + 0.05) / (lo! + 0.05);
}

describe('the WCAG 2.1 contrast formula', () => {
  it('gives the published end points and a known grey', () => {
    // Black on white is the formula's maximum, 21:1; equal colours give 1:1 (WCAG 2.1 definition).
    expect(contrastRatio('#000000', '#ffffff')).toBeCloseTo(21, 5);
    expect(contrastRatio('#777777', '#777777')).toBe(1);
    // #767676 on white, 4.54:1, is the lightest grey that passes AA for text (from memory).
    expect(contrastRatio('#767676', '#ffffff')).toBeCloseTo(4.54, 2);
    expect(contrastRatio('#777777', '#ffffff')).toBeLessThan(4.5);
  });
});

describe('theme text contrast', () => {
  const vars = new Map<string, string>();
  const color = (name: string): string => {
    let value = vars.get(name);
    for (let depth = 0; value?.startsWith('var(') && depth < 5; depth++) value = vars.get(value.slice(4, -1).trim());
    if (!value || !/^#[0-9a-f]{6}$/i.test(value)) throw new Error(`${name} does not resolve to a hex colour (${value})`);
    return value.toLowerCase();
  };

  beforeAll(() => {
    const css = compile(`${ROOT}/src/styles.scss`, { loadPaths: [`${ROOT}/node_modules`], style: 'expanded', silenceDeprecations: ['import'] }).css;
    // The first declaration wins: the page-wide theme on html, before the office's dense variant.
    for (const m of css.matchAll(/(--(?:mat-sys|sw)-[a-z0-9-]+):\s*([^;]+);/g)) if (!vars.has(m[1]!)) vars.set(m[1]!, m[2]!.trim());
  }, 180_000);

  const surfaces = ['--mat-sys-surface', '--sw-card', '--sw-sand'];
  // [text, background, where it is used]
  const pairs: [string, string, string][] = [
    ...['--sw-ok', '--sw-watch', '--sw-alert'].flatMap((t) => surfaces.map((s): [string, string, string] => [t, s, 'reading status word'])),
    ['--sw-ok', '--sw-ok-soft', 'in-range check on its fill'],
    ['--sw-watch', '--sw-watch-soft', 'check on its fill'],
    ['--sw-alert', '--sw-alert-soft', 'out-of-range on its fill'],
    ['--mat-sys-on-surface', '--sw-ok-soft', 'body text on the in-range fill'],
    ['--mat-sys-on-surface', '--sw-watch-soft', 'body text on the check fill'],
    ['--mat-sys-on-surface', '--sw-alert-soft', 'body text on the out-of-range fill'],
    ['--sw-on-alert-soft', '--sw-alert-soft', 'emergency note, past-due and lapsed agreement'],
    ['--sw-on-ember-soft', '--sw-ember-soft', 'renewal-due agreement'],
    ['--mat-sys-on-surface', '--mat-sys-surface-container-high', 'other agreement statuses'],
    ...surfaces.map((s): [string, string, string] => ['--mat-sys-error', s, 'canceled and no-show visit, field errors']),
    ...surfaces.map((s): [string, string, string] => ['--mat-sys-primary', s, 'done visit, links']),
    ...surfaces.map((s): [string, string, string] => ['--mat-sys-on-surface', s, 'invoice status, body text']),
    ...surfaces.map((s): [string, string, string] => ['--mat-sys-on-surface-variant', s, 'lead and secondary text']),
    ['--sw-ink', '--mat-sys-surface', 'page headings'],
    ['--sw-teal', '--sw-teal-soft', 'teal text on its fill'],
    ['--sw-ember', '--mat-sys-surface', 'ember text'],
    ['--sw-on-ember', '--sw-ember', 'call-to-action label'],
    ['--sw-on-bar', '--sw-bar', 'header'],
    ['--sw-on-bar-muted', '--sw-bar', 'header secondary text'],
    ['--mat-sys-on-primary', '--mat-sys-primary', 'filled button label'],
  ];

  it.each(pairs)('%s on %s (%s) has at least 4.5:1', (text, background) => {
    // WCAG 2.1 SC 1.4.3 Contrast (Minimum), level AA: 4.5:1 for normal-size text.
    expect(contrastRatio(color(text), color(background))).toBeGreaterThanOrEqual(4.5);
  });
});
