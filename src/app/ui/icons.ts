import { EnvironmentProviders, inject, provideEnvironmentInitializer } from '@angular/core';
import { MatIconRegistry } from '@angular/material/icon';
import { DomSanitizer } from '@angular/platform-browser';

// Our own small stroke icon set, drawn on a 24 px grid. Shipped inline: no icon font, no request.
const S = (body: string) =>
  `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 24 24" fill="none" stroke="currentColor" stroke-width="2" stroke-linecap="round" stroke-linejoin="round">${body}</svg>`;

export const ICONS: Record<string, string> = {
  home: S('<path d="M3 11l9-7 9 7"/><path d="M5 10v10h14V10"/><path d="M10 20v-6h4v6"/>'),
  calendar: S('<rect x="3" y="5" width="18" height="16" rx="2"/><path d="M3 10h18M8 3v4M16 3v4"/>'),
  wrench: S('<path d="M14.5 6.5a4 4 0 0 0 5 5L21 13l-8 8-3-3 8-8"/><path d="M14.5 6.5L11 3 3 11l3.5 3.5"/>'),
  receipt: S('<path d="M6 3h12v18l-3-2-3 2-3-2-3 2z"/><path d="M9 8h6M9 12h6"/>'),
  shield: S('<path d="M12 3l8 3v6c0 5-3.5 8-8 9-4.5-1-8-4-8-9V6z"/><path d="M9 12l2 2 4-4"/>'),
  settings: S('<circle cx="12" cy="12" r="3"/><path d="M12 2v3M12 19v3M2 12h3M19 12h3M4.9 4.9l2.1 2.1M17 17l2.1 2.1M4.9 19.1L7 17M17 7l2.1-2.1"/>'),
  logout: S('<path d="M15 4h4v16h-4"/><path d="M10 8l-4 4 4 4M6 12h10"/>'),
  person: S('<circle cx="12" cy="8" r="4"/><path d="M4 21c1-4 4-6 8-6s7 2 8 6"/>'),
  people: S('<circle cx="9" cy="8" r="3.5"/><path d="M2.5 20c.8-3.4 3.3-5 6.5-5s5.7 1.6 6.5 5"/><circle cx="17" cy="9" r="2.5"/><path d="M17 14c2.4 0 4 1.3 4.5 4"/>'),
  dispatch: S('<rect x="3" y="4" width="18" height="16" rx="2"/><path d="M9 4v16M15 4v16M3 9h18"/>'),
  bell: S('<path d="M6 16V11a6 6 0 0 1 12 0v5l2 2H4z"/><path d="M10 20a2 2 0 0 0 4 0"/>'),
  menu: S('<path d="M4 6h16M4 12h16M4 18h16"/>'),
  search: S('<circle cx="11" cy="11" r="6"/><path d="M20 20l-4.5-4.5"/>'),
  add: S('<path d="M12 5v14M5 12h14"/>'),
  mail: S('<rect x="3" y="5" width="18" height="14" rx="2"/><path d="M3 7l9 6 9-6"/>'),
  phone: S('<path d="M5 3h4l2 5-2.5 1.5a11 11 0 0 0 6 6L16 13l5 2v4a2 2 0 0 1-2 2A16 16 0 0 1 3 5a2 2 0 0 1 2-2z"/>'),
  snowflake: S('<path d="M12 2v20M4 7l16 10M20 7L4 17"/><path d="M9 4l3 2 3-2M9 20l3-2 3 2"/>'),
  flame: S('<path d="M12 3c1 4 5 5.5 5 10a5 5 0 0 1-10 0c0-2.5 1.5-4 2.5-5 0 2 1 3 2 3 0-3-1-5.5.5-8z"/>'),
  gauge: S('<path d="M4 16a8 8 0 1 1 16 0"/><path d="M12 16l4-5"/><circle cx="12" cy="16" r="1.2"/>'),
  chart: S('<path d="M4 20V4M4 20h16"/><path d="M7 15l4-4 3 3 5-6"/>'),
  // Reading and status marks: a ring for in range, a triangle for check, an octagon for out of range.
  'status-ok': S('<circle cx="12" cy="12" r="9"/><path d="M8 12.5l2.5 2.5L16 9.5"/>'),
  'status-watch': S('<path d="M12 3l10 18H2z"/><path d="M12 10v4M12 17.5v.5"/>'),
  'status-alert': S('<path d="M8 2h8l6 6v8l-6 6H8l-6-6V8z"/><path d="M9 9l6 6M15 9l-6 6"/>'),
  info: S('<circle cx="12" cy="12" r="9"/><path d="M12 11v6M12 7.5v.5"/>'),
  warning: S('<path d="M12 3l10 18H2z"/><path d="M12 10v4M12 17.5v.5"/>'),
  check: S('<path d="M5 12.5l4.5 4.5L19 7.5"/>'),
  close: S('<path d="M6 6l12 12M18 6L6 18"/>'),
  arrow_back: S('<path d="M10 5l-7 7 7 7M3 12h18"/>'),
  chevron_right: S('<path d="M9 5l7 7-7 7"/>'),
  upload: S('<path d="M12 16V4M7 9l5-5 5 5"/><path d="M4 16v4h16v-4"/>'),
  truck: S('<rect x="2" y="6" width="12" height="10" rx="1"/><path d="M14 9h4l4 4v3h-8"/><circle cx="6.5" cy="17.5" r="1.8"/><circle cx="17.5" cy="17.5" r="1.8"/>'),
};

const registered = new WeakSet<MatIconRegistry>();

/** Adds the icon set to the app's registry, once: `<mat-icon svgIcon="home" />`. Call in an injection context. */
export function registerIcons(): void {
  const registry = inject(MatIconRegistry);
  if (registered.has(registry)) return;
  registered.add(registry);
  const sanitizer = inject(DomSanitizer);
  for (const [name, svg] of Object.entries(ICONS)) registry.addSvgIconLiteral(name, sanitizer.bypassSecurityTrustHtml(svg));
}

/**
 * Registers the icon set where an injector is made: on the lazy routes (pages.routes.ts, loaded
 * after the first chunk, which so carries no Material registry) and in component tests.
 */
export function provideIcons(): EnvironmentProviders {
  return provideEnvironmentInitializer(registerIcons);
}
