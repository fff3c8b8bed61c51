import { inject } from '@angular/core';
import { Router, type CanMatchFn } from '@angular/router';
import type { Role } from '../../../../shared/roles';
import { Session } from '../session';
import { homeFor } from './return-url';

/**
 * Lets the route match only for these roles. Signed-out visitors go to the right sign-in page
 * with a return URL; a signed-in user of another role goes to their own area.
 */
export function roleGuard(...roles: Role[]): CanMatchFn {
  return async () => {
    const session = inject(Session);
    const router = inject(Router);
    const user = await session.load();
    if (user && roles.includes(user.role)) return true;
    if (user) return router.parseUrl(homeFor(user.role));
    const returnUrl = router.getCurrentNavigation()?.extractedUrl.toString() ?? '/';
    const page = roles.includes('homeowner') ? '/sign-in' : '/staff/sign-in';
    return router.createUrlTree([page], { queryParams: { returnUrl } });
  };
}

/** Any signed-in user (profile). */
export const signedInGuard: CanMatchFn = async () => {
  const session = inject(Session);
  const router = inject(Router);
  if (await session.load()) return true;
  const returnUrl = router.getCurrentNavigation()?.extractedUrl.toString() ?? '/';
  return router.createUrlTree(['/sign-in'], { queryParams: { returnUrl } });
};
