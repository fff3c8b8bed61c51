import type { ArrivalWindowView } from '../../../../shared/schemas/booking';

export interface WindowDay {
  day: string;
  windows: (ArrivalWindowView & { time: string })[];
}

/** "Tue 14 Jul, 8–10 am" → grouped under "Tue 14 Jul" with "8–10 am" as the choice. */
export function groupByDay(windows: ArrivalWindowView[]): WindowDay[] {
  const out: WindowDay[] = [];
  for (const w of windows) {
    const cut = w.localLabel.indexOf(', ');
    const day = cut > 0 ? w.localLabel.slice(0, cut) : w.start.slice(0, 10);
    const time = cut > 0 ? w.localLabel.slice(cut + 2) : w.localLabel;
    const last = out.at(-1);
    if (last && last.day === day) last.windows.push({ ...w, time });
    else out.push({ day, windows: [{ ...w, time }] });
  }
  return out;
}
