import { clone, listOf, LIST_PARAMS, type Engine } from './engine';
import { noSuch } from './errors';
import { checkKnown, list, str, type Params } from './params';
import type { WireEvent, WireList } from './wire-types';

// Events: every change the fake makes, newest first, as sent to the webhook endpoint.

export function retrieveEvent(e: Engine, id: string): WireEvent {
  const ev = e.events.find((x) => x.id === id);
  if (!ev) throw noSuch('event', id);
  return clone(ev);
}

export function listEvents(e: Engine, q: Params): WireList<WireEvent> {
  checkKnown(q, [...LIST_PARAMS, 'type', 'types', 'delivery_success']);
  const type = str(q, 'type');
  const types = list(q, 'types')?.filter((t): t is string => typeof t === 'string');
  const match = (t: string) => {
    if (type) return type.endsWith('.*') ? t.startsWith(type.slice(0, -1)) : t === type;
    if (types) return types.includes(t);
    return true;
  };
  return listOf(
    e.events.filter((ev) => match(ev.type)),
    q,
    '/v1/events',
  );
}
