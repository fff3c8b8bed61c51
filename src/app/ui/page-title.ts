import { effect, inject } from '@angular/core';
import { Title } from '@angular/platform-browser';

/**
 * Names the tab after what the page shows ("Whitfield household · Seasonwell"), once it is known;
 * until then the route's own title stands. Call from a component's field initialiser.
 */
export function pageTitle(name: () => string | null | undefined): void {
  const title = inject(Title);
  effect(() => {
    const n = name();
    if (n) title.setTitle(`${n} · Seasonwell`);
  });
}
