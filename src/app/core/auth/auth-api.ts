import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { defer, map, switchMap, tap, type Observable } from 'rxjs';
import type { SessionUser } from '../../../../shared/schemas/session';
import { Session } from '../session';

interface SignedIn {
  user: SessionUser;
}
interface Accepted {
  message: string;
}

/** Sign-in, links and passwords. Every write first makes sure the CSRF cookie is there. */
@Injectable({ providedIn: 'root' })
export class AuthApi {
  private readonly http = inject(HttpClient);
  private readonly session = inject(Session);

  private post<T>(url: string, body: unknown): Observable<T> {
    return defer(() => this.session.load()).pipe(switchMap(() => this.http.post<T>(url, body)));
  }

  private signedIn(url: string, body: unknown): Observable<SessionUser> {
    return this.post<SignedIn>(url, body).pipe(
      map(({ user }) => user),
      tap((user) => this.session.set(user)),
    );
  }

  requestLink(email: string): Observable<Accepted> {
    return this.post('/api/auth/link', { email });
  }
  confirmLink(token: string): Observable<SessionUser> {
    return this.signedIn('/api/auth/link/confirm', { token });
  }
  staffSignIn(email: string, password: string): Observable<SessionUser> {
    return this.signedIn('/api/auth/staff/sign-in', { email, password });
  }
  forgotPassword(email: string): Observable<Accepted> {
    return this.post('/api/auth/password/forgot', { email });
  }
  setPassword(token: string, password: string): Observable<SessionUser> {
    return this.signedIn('/api/auth/password/set', { token, password });
  }
  signOutEverywhere(): Observable<void> {
    return this.post<unknown>('/api/auth/sign-out-everywhere', {}).pipe(
      map(() => undefined),
      tap(() => this.session.set(null)),
    );
  }
  inviteHousehold(input: { customerId?: string; email?: string }): Observable<{ email: string }> {
    return this.post('/api/auth/household-invitations', input);
  }
}
