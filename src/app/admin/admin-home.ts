import { ChangeDetectionStrategy, Component } from '@angular/core';
import { AreaLanding, type AreaTile } from '../ui/area-landing';

@Component({
  selector: 'sw-admin-home',
  imports: [AreaLanding],
  host: { class: 'sw-dense' },
  template: `<sw-area-landing heading="Settings" lead="Plans, prices, hours, staff and company details." [tiles]="tiles" />`,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AdminHome {
  protected readonly tiles: AreaTile[] = [
    { title: 'Reports', text: 'Renewal rate, revenue by kind, visits and technician utilisation.', icon: 'chart', path: '/office/reports' },
    { title: 'Plans and prices', text: 'Tiers, what each covers, and what they cost.', icon: 'shield', path: '/admin/plans' },
    { title: 'Hours and booking rules', text: 'Business hours, arrival windows, lead time and cut-offs.', icon: 'calendar', path: '/admin/hours' },
    { title: 'Price book', text: 'Parts, labor, fees and flat-rate tasks, with CSV import and export.', icon: 'receipt', path: '/admin/price-book' },
    { title: 'Staff', text: 'Invite technicians and office staff; disable accounts.', icon: 'people', path: '/admin/staff' },
    { title: 'Access log', text: 'Sign-ins, failed attempts, invitations and role changes.', icon: 'info', path: '/admin/audit' },
    { title: 'Company', text: 'Name, address, phone, sales tax and diagnostic fee.', icon: 'settings', path: '/admin/company' },
  ];
}
