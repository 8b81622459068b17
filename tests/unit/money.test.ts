import { describe, expect, it } from "vitest";
import {
  ceilDiv,
  CURRENCY_CODES,
  formatMoney,
  isCurrencyCode,
  minorToDecimalString,
  minorUnitExponent,
  minorUnitsPerMajor,
  roundUpToMultiple,
} from "@/lib/money";

describe("ISO 4217 minor units", () => {
  it.each([
    // source: ISO 4217 currency code list, "minor unit" column (from memory).
    ["USD", 2],
    ["EUR", 2],
    ["GBP", 2],
    ["CHF", 2],
    ["JPY", 0],
    ["KRW", 0],
    ["ISK", 0],
    ["KWD", 3],
    ["BHD", 3],
  ] as const)("%s has %i decimals", (code, exponent) => {
    expect(minorUnitExponent(code)).toBe(exponent);
    expect(minorUnitsPerMajor(code)).toBe(10 ** exponent);
  });

  it("agrees with the currency data the runtime ships (Unicode CLDR via Intl)", () => {
    for (const code of CURRENCY_CODES) {
      const cldrDigits = new Intl.NumberFormat("en", { style: "currency", currency: code }).resolvedOptions()
        .maximumFractionDigits;
      expect(minorUnitExponent(code), code).toBe(cldrDigits);
    }
  });

  it("recognises only listed codes", () => {
    expect(isCurrencyCode("EUR")).toBe(true);
    expect(isCurrencyCode("eur")).toBe(false);
    expect(isCurrencyCode("XXX")).toBe(false);
  });
});

describe("minor-unit arithmetic", () => {
  it("ceilDiv matches the definition ⌈a / b⌉ on a grid of integers", () => {
    for (let a = -30; a <= 30; a++) {
      for (let b = 1; b <= 7; b++) {
        // reference: the smallest integer q with q·b ≥ a.
        let q = Math.floor(a / b) - 1;
        while (q * b < a) q++;
        expect(ceilDiv(a, b)).toBe(q);
      }
    }
  });

  it("ceilDiv stays exact beyond double-precision division", () => {
    // (2^53 − 1) / 3 = 3002399751580330.33…, so the ceiling is …331.
    expect(ceilDiv(Number.MAX_SAFE_INTEGER, 3)).toBe(3002399751580331);
  });

  it("rounds up to a whole unit", () => {
    expect(roundUpToMultiple(10330, 100)).toBe(10400);
    expect(roundUpToMultiple(10400, 100)).toBe(10400);
    expect(roundUpToMultiple(1501, 1)).toBe(1501);
  });
});

describe("formatting", () => {
  it("writes exact decimal text from minor units", () => {
    expect(minorToDecimalString(10330, "USD")).toBe("103.30");
    expect(minorToDecimalString(5, "USD")).toBe("0.05");
    expect(minorToDecimalString(-5, "EUR")).toBe("-0.05");
    expect(minorToDecimalString(1500, "JPY")).toBe("1500");
    expect(minorToDecimalString(1234, "KWD")).toBe("1.234");
  });

  it("formats with the locale's currency pattern", () => {
    // source: Unicode CLDR currency patterns — en-US "¤#,##0.00", de-DE "#,##0.00 ¤" with "."
    // grouping and "," decimals, ja-JP yen without decimals (from memory).
    expect(formatMoney(123456, "USD")).toBe("$1,234.56");
    expect(formatMoney(123456, "EUR", "de-DE").replace(/\s/g, " ")).toBe("1.234,56 €");
    expect(formatMoney(1500, "JPY", "en-US")).toBe("¥1,500");
    // Beyond 2^53 / 100 a float division would lose the last cent; the decimal string does not.
    expect(formatMoney(900719925474099, "USD")).toBe("$9,007,199,254,740.99");
  });
});

describe("parseMajorAmount", () => {
  it("reads typed amounts into ISO 4217 minor units (USD exponent 2, JPY 0, BHD 3)", async () => {
    const { parseMajorAmount } = await import("@/lib/money");
    expect(parseMajorAmount("35", "USD")).toBe(3500);
    expect(parseMajorAmount("35.5", "USD")).toBe(3550);
    expect(parseMajorAmount("1,234.56", "USD")).toBe(123_456);
    expect(parseMajorAmount("0.07", "USD")).toBe(7);
    expect(parseMajorAmount("500", "JPY")).toBe(500);
    expect(parseMajorAmount("1.5", "JPY")).toBeUndefined();
    expect(parseMajorAmount("1.234", "BHD")).toBe(1234);
    expect(parseMajorAmount("-3", "USD")).toBeUndefined();
    expect(parseMajorAmount("3.999", "USD")).toBeUndefined();
    expect(parseMajorAmount("abc", "USD")).toBeUndefined();
  });
});
