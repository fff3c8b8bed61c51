import { type HttpInterceptorFn, HttpResponse } from '@angular/common/http';
import { Injectable, inject, signal } from '@angular/core';
import { tap } from 'rxjs';

/** Counts the signed-in user's own successful writes, so summary pages know their counts are stale. */
@Injectable({ providedIn: 'root' })
export class WriteActivity {
  readonly writes = signal(0);
}

export const countWrites: HttpInterceptorFn = (req, next) => {
  if (req.method === 'GET' || req.method === 'HEAD' || !req.url.startsWith('/api/')) return next(req);
  const activity = inject(WriteActivity);
  return next(req).pipe(
    tap((event) => {
      if (event instanceof HttpResponse && event.ok) activity.writes.update((n) => n + 1);
    }),
  );
};
