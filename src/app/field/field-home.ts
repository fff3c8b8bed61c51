import { ChangeDetectionStrategy, Component } from '@angular/core';
import { AreaLanding, type AreaTile } from '../ui/area-landing';

@Component({
  selector: 'sw-field-home',
  imports: [AreaLanding],
  template: `<sw-area-landing heading="Today" lead="Your visits, the plan coverage for each, and readings checked as you go." [tiles]="tiles" />`,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class FieldHome {
  protected readonly tiles: AreaTile[] = [
    { title: "Today's visits", text: 'In time order, with the address, window, reason and plan status.', icon: 'calendar' },
    { title: 'Readings', text: 'Split, superheat, subcooling, capacitor, amps and control voltage, checked on the spot.', icon: 'gauge' },
    { title: 'Truck stock', text: 'The parts on your truck.', icon: 'truck' },
  ];
}
