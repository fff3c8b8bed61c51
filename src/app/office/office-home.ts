import { ChangeDetectionStrategy, Component } from '@angular/core';
import { AreaLanding, type AreaTile } from '../ui/area-landing';

@Component({
  selector: 'sw-office-home',
  imports: [AreaLanding],
  host: { class: 'sw-dense' },
  template: `<sw-area-landing heading="Office" lead="Customers, visits, quotes, stock, renewals and reminders." [tiles]="tiles" />`,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class OfficeHome {
  protected readonly tiles: AreaTile[] = [
    { title: 'Customers', text: 'Households, their properties, equipment and history.', icon: 'people', path: '/office/customers' },
    { title: 'Dispatch', text: 'The day and week board: assign visits to technicians.', icon: 'dispatch', path: '/office/dispatch' },
    { title: 'Renewals', text: 'Agreements coming due, past due and lapsed.', icon: 'shield', path: '/office/renewals' },
    { title: 'Quotes', text: 'Open quotes with their age and value, and how many are approved.', icon: 'wrench', path: '/office/quotes' },
    { title: 'Truck stock', text: 'The restock list, restocks and transfers between trucks and the shop.', icon: 'truck', path: '/office/stock' },
    { title: 'Reminders', text: 'Seasonal tune-up, filter and coil-cleaning reminders.', icon: 'bell', path: '/office/reminders' },
  ];
}
