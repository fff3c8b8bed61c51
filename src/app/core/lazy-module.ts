import { PendingTasks, inject, signal, type Signal } from '@angular/core';

/**
 * A module imported once, on first use, in a chunk of its own: a validator (zod with its schemas)
 * or a library a page needs only when the user acts. The page draws without it.
 *
 *   const checks = lazyModule(() => import('../../../shared/schemas/customers'));
 *   …
 *   const { customerCreateSchema } = await checks.load();
 */
export interface LazyModule<T> {
  /** The module once it is in, else null. */
  readonly value: Signal<T | null>;
  /** Imports the module (once; again after a failed attempt) and resolves with it. */
  load(): Promise<T>;
  /**
   * Starts the import now, beside the page's own data, and holds the app unstable until it is in
   * (tests and whenStable wait for it). Call in an injection context, as a constructor does.
   */
  preload(): void;
}

export function lazyModule<T>(importer: () => Promise<T>): LazyModule<T> {
  const value = signal<T | null>(null);
  let loading: Promise<T> | null = null;
  const load = (): Promise<T> => {
    loading ??= importer().then(
      (m) => {
        value.set(m);
        return m;
      },
      (err: unknown) => {
        loading = null;
        throw err;
      },
    );
    return loading;
  };
  return {
    value: value.asReadonly(),
    load,
    preload() {
      if (value()) return;
      const done = inject(PendingTasks).add();
      load().then(done, done);
    },
  };
}
