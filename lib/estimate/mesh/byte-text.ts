// Small helpers for scanning ASCII text held in a byte array without decoding it to a string.

const SPACE = 0x20;
const DIGIT_0 = 0x30;
const DIGIT_9 = 0x39;
const PLUS = 0x2b;
const MINUS = 0x2d;
const DOT = 0x2e;
const LOWER_E = 0x65;
const UPPER_E = 0x45;

// Powers of ten that are exact doubles; m × 10^k or m / 10^k with |k| ≤ 22 and an exact
// integer m is then correctly rounded (the classic fast path for decimal → binary).
const EXACT_POWERS_OF_TEN = Array.from({ length: 23 }, (_, k) => 10 ** k);
const MAX_EXACT_MANTISSA = 2 ** 53;

export function isWhitespace(byte: number): boolean {
  return byte === SPACE || (byte >= 0x09 && byte <= 0x0d);
}

export function isDigit(byte: number): boolean {
  return byte >= DIGIT_0 && byte <= DIGIT_9;
}

export function bytesEqualAscii(bytes: Uint8Array, start: number, end: number, word: string): boolean {
  if (end - start !== word.length) return false;
  for (let i = 0; i < word.length; i++) {
    if (bytes[start + i] !== word.charCodeAt(i)) return false;
  }
  return true;
}

export function asciiSlice(bytes: Uint8Array, start: number, end: number): string {
  let text = "";
  for (let i = start; i < end; i++) text += String.fromCharCode(bytes[i]!);
  return text;
}

/**
 * Parses a decimal number occupying exactly bytes[start, end). Returns NaN when the range is
 * not a plain decimal (so "nan", "inf", hex and empty text are all rejected).
 */
export function parseDecimal(bytes: Uint8Array, start: number, end: number): number {
  let i = start;
  let negative = false;
  const first = bytes[i];
  if (first === MINUS || first === PLUS) {
    negative = first === MINUS;
    i++;
  }
  let mantissa = 0;
  let digitCount = 0;
  let fractionDigits = 0;
  while (i < end && isDigit(bytes[i]!)) {
    mantissa = mantissa * 10 + (bytes[i]! - DIGIT_0);
    digitCount++;
    i++;
  }
  if (i < end && bytes[i] === DOT) {
    i++;
    while (i < end && isDigit(bytes[i]!)) {
      mantissa = mantissa * 10 + (bytes[i]! - DIGIT_0);
      digitCount++;
      fractionDigits++;
      i++;
    }
  }
  if (digitCount === 0) return Number.NaN;
  let exponent = 0;
  if (i < end && (bytes[i] === LOWER_E || bytes[i] === UPPER_E)) {
    i++;
    let exponentNegative = false;
    if (bytes[i] === MINUS || bytes[i] === PLUS) {
      exponentNegative = bytes[i] === MINUS;
      i++;
    }
    const exponentStart = i;
    while (i < end && isDigit(bytes[i]!)) {
      exponent = exponent * 10 + (bytes[i]! - DIGIT_0);
      i++;
    }
    if (i === exponentStart) return Number.NaN;
    if (exponentNegative) exponent = -exponent;
  }
  if (i !== end) return Number.NaN;
  const power = exponent - fractionDigits;
  if (mantissa < MAX_EXACT_MANTISSA && power >= -22 && power <= 22) {
    const magnitude =
      power >= 0 ? mantissa * (EXACT_POWERS_OF_TEN[power] ?? 1) : mantissa / (EXACT_POWERS_OF_TEN[-power] ?? 1);
    return negative ? -magnitude : magnitude;
  }
  return Number(asciiSlice(bytes, start, end));
}
