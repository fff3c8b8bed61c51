import { Injectable } from '@angular/core';

const PREFIX = 'sw.field.draft.';

/**
 * Work typed on site, kept on the phone until the server confirms it: a dropped signal mid-save
 * loses nothing. One entry per visit and part (readings per system, checklist, notes…).
 */
@Injectable({ providedIn: 'root' })
export class VisitDrafts {
  private key(visitId: string, part: string): string {
    return `${PREFIX}${visitId}.${part}`;
  }

  read<T>(visitId: string, part: string): T | null {
    try {
      const raw = localStorage.getItem(this.key(visitId, part));
      return raw ? (JSON.parse(raw) as { value: T }).value : null;
    } catch {
      return null;
    }
  }

  write(visitId: string, part: string, value: unknown): void {
    try {
      localStorage.setItem(this.key(visitId, part), JSON.stringify({ savedAt: new Date().toISOString(), value }));
    } catch {
      // Storage full or blocked: the form still holds the values.
    }
  }

  clear(visitId: string, part: string): void {
    try {
      localStorage.removeItem(this.key(visitId, part));
    } catch {
      /* nothing kept */
    }
  }

  /** Parts of this visit still waiting for the server. */
  pending(visitId: string): string[] {
    const prefix = `${PREFIX}${visitId}.`;
    const out: string[] = [];
    try {
      for (let i = 0; i < localStorage.length; i++) {
        const k = localStorage.key(i);
        if (k?.startsWith(prefix)) out.push(k.slice(prefix.length));
      }
    } catch {
      /* none */
    }
    return out;
  }
}
