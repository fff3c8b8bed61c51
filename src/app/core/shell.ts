import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { RouterLink, RouterOutlet } from '@angular/router';
import { Logo } from '../ui/logo';
import { Session } from './session';
import { ShellNav } from './shell-nav';

/**
 * The page frame. Signed out it is the brand and a sign-in link, written without Material so the
 * first pages load little; the signed-in links and menus come in their own chunk.
 */
@Component({
  selector: 'sw-shell',
  imports: [RouterLink, RouterOutlet, Logo, ShellNav],
  templateUrl: './shell.html',
  styleUrl: './shell.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Shell {
  private readonly session = inject(Session);
  protected readonly user = this.session.user;
  protected readonly loaded = this.session.loaded;

  constructor() {
    void this.session.load();
  }
}
