import { effect, inject } from '@angular/core';
import { ActivatedRoute, Router } from '@angular/router';

/**
 * A list's filter lives in the URL, so a link (from the office home, or a colleague) opens the
 * exact view. Call in an injection context: `read` gives the value the page opened with, and
 * `keep` writes the current filter back without adding a history entry.
 */
export function urlFilters() {
  const route = inject(ActivatedRoute);
  const router = inject(Router);
  const query = route.snapshot.queryParamMap;
  return {
    read(name: string): string | null {
      return query.get(name);
    },
    keep(params: () => Record<string, string | number | null>): void {
      effect(() => {
        const queryParams = params();
        void router.navigate([], { relativeTo: route, queryParams, queryParamsHandling: 'merge', replaceUrl: true });
      });
    },
  };
}
