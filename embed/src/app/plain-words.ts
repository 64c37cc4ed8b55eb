import type { KitDesign, KitOptionsResponse, StoredCatalogStrip } from './api-types.js';

/** A price in the shopper's locale (`locale` attribute), e.g. "€312.00" or "312,00 €". */
export function money(amount: number, currency: string, locale: string | undefined): string {
  try {
    return new Intl.NumberFormat(locale || undefined, { style: 'currency', currency }).format(amount);
  } catch {
    // An unknown locale or currency code from the page's attributes must not blank the price.
    return `${amount.toFixed(2)} ${currency}`;
  }
}

/** A measured number in the shopper's locale ("1,5" in German). */
export function figure(value: number, locale: string | undefined, digits = 1): string {
  try {
    return new Intl.NumberFormat(locale || undefined, { maximumFractionDigits: digits }).format(value);
  } catch {
    return String(value);
  }
}

const POSITION_WORDS: Record<string, string> = { bottom: 'at the foot', middle: 'halfway up', top: 'at the top', given: 'where you placed them' };

/** What makes a design, in words: the strip and where the controller goes. */
export function designInWords(design: KitDesign, strips: readonly StoredCatalogStrip[], locale: string | undefined): string {
  const c = design.choices;
  const strip = strips.find((s) => s.sku === c.stripSku);
  const name = strip?.description ?? `${figure(c.voltageV, locale)} V strip, ${figure(c.powerWPerM, locale)} W/m`;
  const controller = POSITION_WORDS[c.controllerPosition] ?? c.controllerPosition;
  const drivers = POSITION_WORDS[c.driverPosition] ?? c.driverPosition;
  return `${name}; controller ${controller}, power supplies ${drivers}`;
}

/** The checks of a design in one sentence; the warnings themselves are listed beside it. */
export function checksInWords(design: KitDesign): string {
  const { pass, warn, fail } = design.summary.checks;
  const total = pass + warn + fail;
  if (fail > 0) return `${fail} of ${total} checks fail: this kit needs changes.`;
  if (warn === 0) return `All ${total} design checks pass: power, cable lengths, voltage drop and controller outputs.`;
  return `${pass} of ${total} checks pass; ${warn === 1 ? 'one needs' : `${warn} need`} your attention:`;
}

/** When no kit of the shop passes for this stair: say so, and what to try. */
export function noKitInWords(res: KitOptionsResponse): string {
  if (res.possible === 0) return 'This shop has no strip that fits your choice. Try another strip.';
  return 'None of this shop’s kits passes every check for this stair. Try another strip, or ask the shop for advice.';
}

/** A label for a strip in the choice list. */
export function stripLabel(strip: StoredCatalogStrip, locale: string | undefined): string {
  return strip.description ?? `${figure(strip.voltageV, locale)} V, ${figure(strip.powerWPerM, locale)} W/m (${strip.sku})`;
}
