import ICAL from 'ical.js';

/**
 * Parses an iCalendar text with ical.js, registering the file's own VTIMEZONE components so
 * TZID times resolve from them (ical.js carries no zone data of its own).
 */
export function parseCalendar(text: string) {
  const cal = new ICAL.Component(ICAL.parse(text));
  const zones = cal.getAllSubcomponents('vtimezone');
  for (const z of zones) ICAL.TimezoneService.register(z);
  const events = cal.getAllSubcomponents('vevent').map((c) => new ICAL.Event(c));
  return { cal, zones, events };
}
