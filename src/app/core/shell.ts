import { BreakpointObserver } from '@angular/cdk/layout';
import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatMenuModule } from '@angular/material/menu';
import { MatToolbarModule } from '@angular/material/toolbar';
import { Router, RouterLink, RouterLinkActive, RouterOutlet } from '@angular/router';
import { Logo } from '../ui/logo';
import { compactBelow, navigationFor } from './navigation';
import { Session } from './session';
import { map } from 'rxjs';

// Every width at which some role's bar changes; the observer answers when any of them is crossed.
const BREAKPOINTS = [...new Set((['homeowner', 'technician', 'office'] as const).map(compactBelow))].map((w) => `(min-width: ${w}px)`);

@Component({
  selector: 'sw-shell',
  imports: [MatToolbarModule, MatButtonModule, MatIconModule, MatMenuModule, RouterLink, RouterLinkActive, RouterOutlet, Logo],
  templateUrl: './shell.html',
  styleUrl: './shell.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Shell {
  private readonly session = inject(Session);
  private readonly router = inject(Router);
  protected readonly user = this.session.user;
  protected readonly links = computed(() => navigationFor(this.session.role()));
  protected readonly barLinks = computed(() => this.links().filter((l) => !l.more));
  protected readonly moreLinks = computed(() => this.links().filter((l) => l.more));
  private readonly widths = inject(BreakpointObserver);
  private readonly width = toSignal(this.widths.observe(BREAKPOINTS).pipe(map(() => window.innerWidth)), {
    initialValue: typeof window === 'undefined' ? 1280 : window.innerWidth,
  });
  /** One labelled Menu button instead of the links, where the links with their words would not fit one row. */
  protected readonly compact = computed(() => this.width() < compactBelow(this.session.role()));

  constructor() {
    void this.session.load();
  }

  protected async signOut(): Promise<void> {
    await this.session.signOut();
    await this.router.navigateByUrl('/');
  }
}
