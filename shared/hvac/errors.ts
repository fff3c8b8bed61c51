/** Thrown for a reading that is impossible or outside what a method covers; `field` names the input. */
export class ReadingInputError extends Error {
  readonly field: string;

  constructor(field: string, message: string) {
    super(`${field}: ${message}`);
    this.name = 'ReadingInputError';
    this.field = field;
  }
}

export function requireFinite(field: string, value: unknown): number {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new ReadingInputError(field, 'must be a finite number');
  }
  return value;
}

export function requirePositive(field: string, value: unknown): number {
  const n = requireFinite(field, value);
  if (n <= 0) throw new ReadingInputError(field, 'must be greater than 0');
  return n;
}

export function requireNonNegative(field: string, value: unknown): number {
  const n = requireFinite(field, value);
  if (n < 0) throw new ReadingInputError(field, 'must not be negative');
  return n;
}
