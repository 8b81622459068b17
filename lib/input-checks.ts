export class DomainInputError extends RangeError {
  readonly field: string;

  constructor(field: string, message: string) {
    super(`${field}: ${message}`);
    this.name = "DomainInputError";
    this.field = field;
  }
}

export function requirePositive(field: string, value: number): number {
  if (!Number.isFinite(value) || value <= 0) {
    throw new DomainInputError(field, `must be a finite number > 0, got ${value}`);
  }
  return value;
}

export function requireNonNegative(field: string, value: number): number {
  if (!Number.isFinite(value) || value < 0) {
    throw new DomainInputError(field, `must be a finite number ≥ 0, got ${value}`);
  }
  return value;
}

export function requireFraction(field: string, value: number): number {
  if (!Number.isFinite(value) || value <= 0 || value > 1) {
    throw new DomainInputError(field, `must be a fraction in (0, 1], got ${value}`);
  }
  return value;
}

export function requireUnitInterval(field: string, value: number): number {
  if (!Number.isFinite(value) || value < 0 || value > 1) {
    throw new DomainInputError(field, `must be in [0, 1], got ${value}`);
  }
  return value;
}

export function requireNonNegativeInteger(field: string, value: number): number {
  if (!Number.isSafeInteger(value) || value < 0) {
    throw new DomainInputError(field, `must be a whole number ≥ 0, got ${value}`);
  }
  return value;
}

export function requirePositiveInteger(field: string, value: number): number {
  if (!Number.isSafeInteger(value) || value <= 0) {
    throw new DomainInputError(field, `must be a whole number > 0, got ${value}`);
  }
  return value;
}
