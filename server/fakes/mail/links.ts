// Pulls every http(s) URL out of a message so tests can follow sign-in and payment links.

const URL_PATTERN = /https?:\/\/[^\s<>"'`\\]+/gi;
// Sentence punctuation that usually follows a link in prose rather than belonging to it.
const TRAILING = /[.,;:!?)\]}]+$/;

const NAMED_ENTITIES: Record<string, string> = {
  amp: '&',
  lt: '<',
  gt: '>',
  quot: '"',
  apos: "'",
  nbsp: '\u00a0',
};

/** Decodes the HTML character references that show up inside href values. */
export function decodeHtmlEntities(html: string): string {
  return html.replace(/&(#x[0-9a-f]+|#[0-9]+|[a-z]+);/gi, (whole, ref: string) => {
    if (ref[0] === '#') {
      const code = ref[1] === 'x' || ref[1] === 'X' ? parseInt(ref.slice(2), 16) : parseInt(ref.slice(1), 10);
      return Number.isFinite(code) && code > 0 && code <= 0x10ffff ? String.fromCodePoint(code) : whole;
    }
    return NAMED_ENTITIES[ref.toLowerCase()] ?? whole;
  });
}

function scan(source: string, found: Set<string>): void {
  for (const match of source.matchAll(URL_PATTERN)) {
    const url = match[0].replace(TRAILING, '');
    if (url.length > 'https://'.length) found.add(url);
  }
}

/** Unique http(s) URLs from the text body, then the HTML body, in order of first appearance. */
export function extractLinks(text: string | null | undefined, html: string | null | undefined): string[] {
  const found = new Set<string>();
  if (text) scan(text, found);
  if (html) scan(decodeHtmlEntities(html), found);
  return [...found];
}
