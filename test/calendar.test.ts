import { describe, expect, it } from 'vitest';
import { DateTime } from 'luxon';
import { CalendarInputError, technicianFeed, visitInvitation, visitUid, type VisitInvitation } from '../server/integrations/calendar';
import { parseCalendar } from './support/calendar';

// Expected instants are worked out from the IANA tz database (America/Chicago: CST = UTC−6, CDT = UTC−5;
// 2026 changes on 8 Mar and 1 Nov, US rule since 2007). Property names and values follow RFC 5545 / RFC 5546.
const TZ = 'America/Chicago';

const base: VisitInvitation = {
  uid: visitUid(4107),
  sequence: 0,
  method: 'REQUEST',
  start: '2026-03-07T09:00:00-06:00',
  end: '2026-03-07T10:30:00-06:00',
  timeZone: TZ,
  summary: 'Spring tune-up',
  description: 'Two tune-ups a year plan; check condensate switch and temperature split',
  location: '18 Larkspur Lane, Cedar Hollow',
  organizer: { name: 'Seasonwell office', email: 'office@seasonwell.local' },
  attendee: { name: 'Jordan Quill', email: 'jordan.quill@example.test' },
  stamp: '2026-03-01T15:00:00Z',
};

/** Each event's start and end as instants, the zone its start resolved in, and its status. */
function eventTimes(text: string) {
  return parseCalendar(text).events.map((e) => ({
    start: e.startDate.toJSDate(),
    end: e.endDate.toJSDate(),
    tz: e.startDate.zone.tzid,
    status: e.component.getFirstPropertyValue('status'),
  }));
}

/** DTSTART/DTEND lines of the events (the VTIMEZONE's own DTSTART lines have no TZID). */
function rawDtstart(text: string): string[] {
  return text.split(/\r?\n/).filter((l) => l.startsWith('DTSTART;') || l.startsWith('DTEND;'));
}

describe('visitInvitation', () => {
  it('writes a REQUEST that ical.js reads back with the right instants and zone', () => {
    const text = visitInvitation(base);
    const { cal, zones, events } = parseCalendar(text);
    expect(cal.getFirstPropertyValue('method')).toBe('REQUEST');
    expect(zones.map((z) => z.getFirstPropertyValue('tzid'))).toEqual([TZ]);
    expect(events).toHaveLength(1);
    const ev = events[0]!;
    expect(ev.uid).toBe('visit-4107@seasonwell.local');
    expect(ev.sequence).toBe(0);
    expect(ev.startDate.zone.tzid).toBe(TZ);
    expect(ev.startDate.toJSDate().toISOString()).toBe('2026-03-07T15:00:00.000Z'); // 09:00 CST
    expect(ev.endDate.toJSDate().toISOString()).toBe('2026-03-07T16:30:00.000Z');
    expect(ev.summary).toBe('Spring tune-up');
    expect(ev.location).toBe(base.location);
    expect(ev.description).toBe(base.description);
    expect(ev.component.getFirstPropertyValue('status')).toBe('CONFIRMED');
    expect(ev.organizer).toBe('mailto:office@seasonwell.local');
    expect(String(ev.attendees[0]!.getFirstValue()).toLowerCase()).toBe('mailto:jordan.quill@example.test');
    expect(ev.attendees[0]!.getParameter('cn')).toBe('Jordan Quill');
    // RFC 5545 §3.8.7.2: DTSTAMP is in UTC.
    expect(text).toMatch(/\r\nDTSTAMP:20260301T150000Z\r\n/);
    expect(rawDtstart(text)).toEqual(['DTSTART;TZID=America/Chicago:20260307T090000', 'DTEND;TZID=America/Chicago:20260307T103000']);
  });

  it('keeps local times right on both sides of the spring change', () => {
    const before = visitInvitation(base);
    const after = visitInvitation({ ...base, uid: visitUid(4108), start: '2026-03-09T09:00:00-05:00', end: '2026-03-09T10:30:00-05:00' });
    const a = parseCalendar(before).events[0]!;
    const b = parseCalendar(after).events[0]!;
    expect(a.startDate.toJSDate().toISOString()).toBe('2026-03-07T15:00:00.000Z'); // CST, UTC−6
    expect(b.startDate.toJSDate().toISOString()).toBe('2026-03-09T14:00:00.000Z'); // CDT, UTC−5
    expect(rawDtstart(after)[0]).toBe('DTSTART;TZID=America/Chicago:20260309T090000');
    const [na] = eventTimes(before);
    const [nb] = eventTimes(after);
    expect(na!.start.toISOString()).toBe('2026-03-07T15:00:00.000Z');
    expect(nb!.start.toISOString()).toBe('2026-03-09T14:00:00.000Z');
    expect(nb!.end.toISOString()).toBe('2026-03-09T15:30:00.000Z');
    expect(na!.tz).toBe(TZ);
    expect(nb!.tz).toBe(TZ);
  });

  it('and on both sides of the autumn change', () => {
    const sat = visitInvitation({ ...base, start: '2026-10-31T13:00:00-05:00', end: '2026-10-31T15:00:00-05:00' });
    const mon = visitInvitation({ ...base, start: '2026-11-02T13:00:00-06:00', end: '2026-11-02T15:00:00-06:00' });
    expect(parseCalendar(sat).events[0]!.startDate.toJSDate().toISOString()).toBe('2026-10-31T18:00:00.000Z'); // CDT
    expect(parseCalendar(mon).events[0]!.startDate.toJSDate().toISOString()).toBe('2026-11-02T19:00:00.000Z'); // CST
    expect(eventTimes(mon)[0]!.end.toISOString()).toBe('2026-11-02T21:00:00.000Z');
    expect(rawDtstart(sat)[0]).toBe('DTSTART;TZID=America/Chicago:20261031T130000');
    expect(rawDtstart(mon)[0]).toBe('DTSTART;TZID=America/Chicago:20261102T130000');
  });

  it('writes the local clock time when given a Luxon DateTime in another zone', () => {
    const start = DateTime.fromISO('2026-07-14T13:00:00Z', { zone: 'UTC' });
    const text = visitInvitation({ ...base, start, end: start.plus({ minutes: 120 }) });
    expect(rawDtstart(text)).toEqual([
      'DTSTART;TZID=America/Chicago:20260714T080000', // 13:00 UTC = 08:00 CDT
      'DTEND;TZID=America/Chicago:20260714T100000',
    ]);
    expect(eventTimes(text)[0]!.start.toISOString()).toBe('2026-07-14T13:00:00.000Z');
  });

  it('a reschedule keeps the UID and raises SEQUENCE; a cancellation uses METHOD:CANCEL and STATUS:CANCELLED', () => {
    const booked = parseCalendar(visitInvitation(base));
    const moved = parseCalendar(visitInvitation({ ...base, sequence: 1, start: '2026-03-10T13:00:00-05:00', end: '2026-03-10T14:30:00-05:00' }));
    const canceled = parseCalendar(visitInvitation({ ...base, sequence: 2, method: 'CANCEL', start: '2026-03-10T13:00:00-05:00', end: '2026-03-10T14:30:00-05:00' }));
    const uids = [booked, moved, canceled].map((p) => p.events[0]!.uid);
    expect(new Set(uids)).toEqual(new Set(['visit-4107@seasonwell.local']));
    expect([booked, moved, canceled].map((p) => p.events[0]!.sequence)).toEqual([0, 1, 2]);
    expect(moved.events[0]!.startDate.toJSDate().toISOString()).toBe('2026-03-10T18:00:00.000Z');
    expect(canceled.cal.getFirstPropertyValue('method')).toBe('CANCEL');
    expect(canceled.events[0]!.component.getFirstPropertyValue('status')).toBe('CANCELLED');
    expect(eventTimes(visitInvitation({ ...base, sequence: 2, method: 'CANCEL' }))[0]!.status).toBe('CANCELLED');
  });

  it('the VTIMEZONE carries the offsets Intl reports for Chicago', () => {
    const { zones } = parseCalendar(visitInvitation(base));
    const offsetTo = (name: string) => String(zones[0]!.getFirstSubcomponent(name)!.getFirstPropertyValue('tzoffsetto'));
    const intlOffset = (iso: string) =>
      new Intl.DateTimeFormat('en-US', { timeZone: TZ, timeZoneName: 'longOffset' }).formatToParts(new Date(iso)).find((p) => p.type === 'timeZoneName')!.value;
    expect(intlOffset('2026-07-14T12:00:00Z')).toBe('GMT-05:00');
    expect(intlOffset('2026-01-14T12:00:00Z')).toBe('GMT-06:00');
    expect(offsetTo('daylight')).toBe('-05:00');
    expect(offsetTo('standard')).toBe('-06:00');
  });

  it('rejects bad input by field', () => {
    const bad: Array<[Partial<VisitInvitation>, RegExp]> = [
      [{ timeZone: 'Central' }, /^timeZone:/],
      [{ end: '2026-03-07T08:00:00-06:00' }, /^end:/],
      [{ start: 'tomorrow morning' }, /^start:/],
      [{ start: '2026-03-07T09:00:00' }, /^start:.*offset/],
      [{ sequence: -1 }, /^sequence:/],
      [{ sequence: 1.5 }, /^sequence:/],
      [{ method: 'PUBLISH' as 'REQUEST' }, /^method:/],
      [{ uid: 'visit 1' }, /^uid:/],
      [{ attendee: { name: 'Jordan Quill', email: 'not-an-address' } }, /^attendee\.email:/],
      [{ organizer: { name: '', email: 'office@seasonwell.local' } }, /^organizer\.name:/],
      [{ summary: '' }, /^summary:/],
    ];
    for (const [change, message] of bad) {
      expect(() => visitInvitation({ ...base, ...change })).toThrow(CalendarInputError);
      expect(() => visitInvitation({ ...base, ...change })).toThrow(message);
    }
    expect(() => visitUid('')).toThrow(/^visitId:/);
  });
});

describe('technicianFeed', () => {
  const feed = () =>
    technicianFeed({
      technician: { id: 'tech-3', name: 'Robin Ash' },
      timeZone: TZ,
      stamp: '2026-03-01T15:00:00Z',
      visits: [
        { id: 501, start: '2026-03-06T08:00:00-06:00', end: '2026-03-06T09:30:00-06:00', summary: 'Tune-up', location: '4 Birch Court' },
        { id: 502, sequence: 3, start: '2026-03-09T10:00:00-05:00', end: '2026-03-09T12:00:00-05:00', summary: 'No-cooling call' },
        { id: 503, start: '2026-03-10T08:00:00-05:00', end: '2026-03-10T09:30:00-05:00', summary: 'Tune-up', status: 'canceled' },
      ],
    });

  it('publishes the week’s visits across the spring change, dropping canceled ones', () => {
    const text = feed();
    const { cal, zones, events } = parseCalendar(text);
    expect(cal.getFirstPropertyValue('method')).toBe('PUBLISH');
    expect(zones).toHaveLength(1);
    expect(events.map((e) => [e.uid, e.sequence, e.startDate.toJSDate().toISOString(), e.endDate.toJSDate().toISOString()])).toEqual([
      ['visit-501@seasonwell.local', 0, '2026-03-06T14:00:00.000Z', '2026-03-06T15:30:00.000Z'], // CST
      ['visit-502@seasonwell.local', 3, '2026-03-09T15:00:00.000Z', '2026-03-09T17:00:00.000Z'], // CDT
    ]);
    expect(events.every((e) => e.startDate.zone.tzid === TZ)).toBe(true);
    expect(eventTimes(text).map((e) => e.start.toISOString())).toEqual(['2026-03-06T14:00:00.000Z', '2026-03-09T15:00:00.000Z']);
    expect(text).toContain('X-WR-CALNAME:Visits: Robin Ash');
  });

  it('an empty week is still a valid calendar, and a bad visit names its index', () => {
    const empty = technicianFeed({ technician: { id: 't', name: 'Robin Ash' }, timeZone: TZ, visits: [] });
    expect(parseCalendar(empty).events).toEqual([]);
    expect(() =>
      technicianFeed({
        technician: { id: 't', name: 'Robin Ash' },
        timeZone: TZ,
        visits: [{ id: 1, start: '2026-03-09T10:00:00-05:00', end: '2026-03-09T09:00:00-05:00', summary: 'x' }],
      }),
    ).toThrow(/^visits\.0\.end:/);
  });
});
