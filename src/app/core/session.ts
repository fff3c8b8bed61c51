import { HttpClient } from '@angular/common/http';
import { Injectable, computed, inject, signal } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import { HOME_AREA, type Role } from '../../../shared/roles';
import type { CompanyLocaleInfo, SessionInfo, SessionUser } from '../../../shared/schemas/session';

/** Who is signed in. The server is the authority; this mirrors it for navigation. */
@Injectable({ providedIn: 'root' })
export class Session {
  private readonly http = inject(HttpClient);
  private readonly current = signal<SessionUser | null>(null);
  private readonly loadedOnce = signal(false);
  private readonly companyLocale = signal<CompanyLocaleInfo | null>(null);
  private pending: Promise<SessionUser | null> | null = null;

  readonly user = this.current.asReadonly();
  readonly loaded = this.loadedOnce.asReadonly();
  readonly role = computed<Role | null>(() => this.current()?.role ?? null);
  /** The company's time zone, in which every date on screen is written; the browser's until the session answers. */
  readonly timeZone = computed(() => this.companyLocale()?.timeZone ?? Intl.DateTimeFormat().resolvedOptions().timeZone);
  /** The country phone numbers are written for. */
  readonly country = computed(() => this.companyLocale()?.country ?? 'US');
  readonly homePath = computed(() => {
    const role = this.role();
    return role ? `/${HOME_AREA[role]}` : '/';
  });

  /** Loads the session once (or again with force). */
  load(force = false): Promise<SessionUser | null> {
    if (this.pending && !force) return this.pending;
    this.pending = firstValueFrom(this.http.get<SessionInfo>('/api/session'))
      .then((body) => {
        if (body.company) this.companyLocale.set(body.company);
        return body.user ?? null;
      })
      .catch(() => null)
      .then((user) => {
        this.current.set(user);
        this.loadedOnce.set(true);
        return user;
      });
    return this.pending;
  }

  set(user: SessionUser | null): void {
    this.current.set(user);
    this.loadedOnce.set(true);
    this.pending = Promise.resolve(user);
  }

  async signOut(): Promise<void> {
    await firstValueFrom(this.http.post('/api/auth/sign-out', {})).catch(() => undefined);
    this.set(null);
  }
}
