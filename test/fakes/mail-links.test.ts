import { describe, expect, it } from 'vitest';
import { decodeHtmlEntities, extractLinks } from '../../server/fakes/mail';

describe('extractLinks', () => {
  it('drops sentence punctuation after a link but keeps query strings whole', () => {
    const text = 'Sign in at https://portal.example.test/sign-in?token=a-b_c~d&next=%2Fvisits. Then see (https://portal.example.test/help), thanks!';
    expect(extractLinks(text, null)).toEqual(['https://portal.example.test/sign-in?token=a-b_c~d&next=%2Fvisits', 'https://portal.example.test/help']);
  });

  it('decodes character references in HTML attributes and de-duplicates across parts', () => {
    // HTML standard: named (&amp;), decimal (&#38;) and hex (&#x26;) references all mean "&".
    const html = `<a href="https://a.example.test/p?x=1&amp;y=2">one</a> <a href='https://a.example.test/q?x=1&#38;y=2&#x26;z=3'>two</a>`;
    expect(extractLinks('https://a.example.test/p?x=1&y=2', html)).toEqual(['https://a.example.test/p?x=1&y=2', 'https://a.example.test/q?x=1&y=2&z=3']);
  });

  it('ignores mailto, tel and bare scheme fragments', () => {
    expect(extractLinks('mailto:office@example.test tel:+15550100 https:// http://', '<a href="mailto:x@example.test">x</a>')).toEqual([]);
    expect(extractLinks(undefined, undefined)).toEqual([]);
  });

  it('leaves unknown or out-of-range references alone', () => {
    expect(decodeHtmlEntities('&bogus; &#0; &#x110000; &lt;')).toBe('&bogus; &#0; &#x110000; <');
  });
});
