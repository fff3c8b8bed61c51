import { parsePhoneNumberFromString, type CountryCode } from 'libphonenumber-js';
import { keptBy } from './kept';

// Phone numbers are stored in E.164 ("+18165550142"); people read them in their country's own
// format. Formatting follows libphonenumber-js (the JavaScript port of Google's libphonenumber).

const formatted = keptBy<string>(2_000);

/**
 * A number as a person in `country` writes it: national format for a number of that country
 * ("(816) 555-0142" in the US), international for any other ("+44 20 7946 0018"). Text that
 * is not a phone number comes back as it was.
 */
export function formatPhone(stored: string, country: string): string {
  // Parsing is the cost; a page of visits names the same office number on every row.
  return formatted(`${country}|${stored}`, () => {
    const n = parsePhoneNumberFromString(stored, country as CountryCode);
    if (!n || !n.isPossible()) return stored;
    return n.country === country ? n.formatNational() : n.formatInternational();
  });
}

/** The `tel:` link for a number (RFC 3966: the global number, no spaces), or null if it is none. */
export function phoneHref(stored: string, country: string): string | null {
  const n = parsePhoneNumberFromString(stored, country as CountryCode);
  return n && n.isPossible() ? n.getURI() : null;
}
