/**
 * A bounded memo for pure functions of a few values (labels of instants, formatted phone numbers):
 * `make()` runs once per key, and the whole map is let go once it holds `max` answers, so a
 * long-running process never grows with the data it has seen.
 */
export function keptBy<T>(max: number): (key: string, make: () => T) => T {
  const kept = new Map<string, T>();
  return (key, make) => {
    const hit = kept.get(key);
    if (hit !== undefined) return hit;
    const value = make();
    if (kept.size >= max) kept.clear();
    kept.set(key, value);
    return value;
  };
}
