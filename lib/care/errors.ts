/** Thrown by every lib/care function when its input cannot be computed with; the message says why. */
export class CareInputError extends Error {
  override readonly name = "CareInputError";
  /** The input field at fault, e.g. "shape.lengthMm". */
  readonly field: string | undefined;
  constructor(message: string, field?: string) {
    super(message);
    this.field = field;
  }
}

export function requireFinite(value: number, field: string): number {
  if (typeof value !== "number" || !Number.isFinite(value)) {
    throw new CareInputError(`${field} must be a finite number, got ${String(value)}`, field);
  }
  return value;
}

export function requirePositive(value: number, field: string): number {
  requireFinite(value, field);
  if (value <= 0) throw new CareInputError(`${field} must be greater than 0, got ${value}`, field);
  return value;
}

export function requireNonNegative(value: number, field: string): number {
  requireFinite(value, field);
  if (value < 0) throw new CareInputError(`${field} must not be negative, got ${value}`, field);
  return value;
}
