/**
 * Intl date formatters, built once per locale and options and kept for the life of the process
 * (or page). Building an `Intl.DateTimeFormat` loads ICU data for its locale and zone and costs
 * far more than formatting with it, so code that labels many dates (a board of visits, a list of
 * terms) asks here instead of calling the constructor each time.
 */
const kept = new Map<string, Intl.DateTimeFormat>();

export function dateTimeFormat(locale: string, options: Intl.DateTimeFormatOptions): Intl.DateTimeFormat {
  // Options are written in the code, so their key order is fixed at each call site.
  const key = `${locale}|${JSON.stringify(options)}`;
  let format = kept.get(key);
  if (!format) {
    format = new Intl.DateTimeFormat(locale, options);
    kept.set(key, format);
  }
  return format;
}
