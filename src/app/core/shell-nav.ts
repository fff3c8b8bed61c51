import { BreakpointObserver } from '@angular/cdk/layout';
import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatMenuModule } from '@angular/material/menu';
import { Router, RouterLink, RouterLinkActive } from '@angular/router';
import { map } from 'rxjs';
import { registerIcons } from '../ui/icons';
import { compactBelow, navigationFor } from './navigation';
import { Session } from './session';

// Every width at which some role's bar changes; the observer answers when any of them is crossed.
const BREAKPOINTS = [...new Set((['homeowner', 'technician', 'office'] as const).map(compactBelow))].map((w) => `(min-width: ${w}px)`);

/**
 * The signed-in part of the header: the role's links and the account menu. Loaded only once someone
 * is signed in, so the signed-out pages carry none of Material's buttons, menus and overlays.
 */
@Component({
  selector: 'sw-shell-nav',
  imports: [MatButtonModule, MatIconModule, MatMenuModule, RouterLink, RouterLinkActive],
  templateUrl: './shell-nav.html',
  styleUrl: './shell-nav.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ShellNav {
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
    registerIcons();
  }

  protected async signOut(): Promise<void> {
    await this.session.signOut();
    await this.router.navigateByUrl('/');
  }
}
