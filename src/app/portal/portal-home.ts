import { ChangeDetectionStrategy, Component } from '@angular/core';
import { AreaLanding, type AreaTile } from '../ui/area-landing';
import { DueList } from './reminders/due-list';

@Component({
  selector: 'sw-portal-home',
  imports: [AreaLanding, DueList],
  template: `<sw-area-landing heading="Your home" lead="Everything about your heating and cooling, in one place." [tiles]="tiles" />
    <sw-due-list />`,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PortalHome {
  protected readonly tiles: AreaTile[] = [
    { title: 'Book a visit', text: 'No cooling, no heat, or time for a tune-up: pick a time that suits you.', icon: 'calendar', path: '/portal/booking' },
    { title: 'My equipment', text: 'Your systems, their age and warranty, and everything done to them.', icon: 'home', path: '/portal/home' },
    { title: 'My plan', text: 'What your maintenance plan covers, and renewing it online.', icon: 'shield', path: '/portal/plan' },
    { title: 'Invoices', text: 'See and pay your invoices.', icon: 'receipt', path: '/portal/invoices' },
  ];
}
