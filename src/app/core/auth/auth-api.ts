import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { firstValueFrom } from 'rxjs';
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

  private async post<T>(url: string, body: unknown): Promise<T> {
    await this.session.load();
    return firstValueFrom(this.http.post<T>(url, body));
  }

  private async signedIn(url: string, body: unknown): Promise<SessionUser> {
    const { user } = await this.post<SignedIn>(url, body);
    this.session.set(user);
    return user;
  }

  requestLink(email: string): Promise<Accepted> {
    return this.post('/api/auth/link', { email });
  }
  confirmLink(token: string): Promise<SessionUser> {
    return this.signedIn('/api/auth/link/confirm', { token });
  }
  staffSignIn(email: string, password: string): Promise<SessionUser> {
    return this.signedIn('/api/auth/staff/sign-in', { email, password });
  }
  forgotPassword(email: string): Promise<Accepted> {
    return this.post('/api/auth/password/forgot', { email });
  }
  setPassword(token: string, password: string): Promise<SessionUser> {
    return this.signedIn('/api/auth/password/set', { token, password });
  }
  async signOutEverywhere(): Promise<void> {
    await this.post('/api/auth/sign-out-everywhere', {});
    this.session.set(null);
  }
  inviteHousehold(input: { customerId?: string; email?: string }): Promise<{ email: string }> {
    return this.post('/api/auth/household-invitations', input);
  }
}
