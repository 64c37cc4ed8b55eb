/**
 * Money in integer minor units (cents), so 14 × 0.60 adds up to exactly 8.40 and a total
 * never shows float noise. Prices arrive as decimal major units and leave the same way.
 */
export interface Currency {
  code: string;
  /** Digits of the minor unit: 2 for EUR, 0 for JPY. */
  digits: number;
  scale: number;
}

export function toMinor(price: number, currency: Currency): number {
  return Math.round(price * currency.scale);
}

export function fromMinor(minor: number, currency: Currency): number {
  // Division by a power of ten of an integer gives the nearest double to the decimal value.
  return minor / currency.scale;
}
