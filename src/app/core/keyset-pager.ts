import { computed, signal } from '@angular/core';

/**
 * Forward-only server cursors made browsable both ways: the cursors of the pages already seen are
 * kept, so Previous goes back without an OFFSET. `after()` is the cursor of the page on screen.
 */
export class KeysetPager {
  private readonly trail = signal<(string | undefined)[]>([undefined]);
  readonly after = computed(() => this.trail().at(-1));
  readonly page = computed(() => this.trail().length);
  readonly hasPrevious = computed(() => this.trail().length > 1);

  next(cursor: string | null): void {
    if (cursor) this.trail.update((t) => [...t, cursor]);
  }

  previous(): void {
    this.trail.update((t) => (t.length > 1 ? t.slice(0, -1) : t));
  }

  reset(): void {
    this.trail.set([undefined]);
  }
}
