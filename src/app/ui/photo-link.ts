/**
 * The accessible name of a thumbnail that opens the full photo: what it shows, and that it opens
 * in a new tab (WCAG 2.1, 2.4.4 Link Purpose). The thumbnail itself is then decorative.
 */
export function photoLinkName(f: { caption?: string | null; originalName?: string | null; category?: string | null }): string {
  const what = f.caption?.trim() || (f.category === 'nameplate' ? 'Nameplate photo' : '') || f.originalName?.trim() || 'Photo';
  return `Open photo: ${what} (opens in a new tab)`;
}
