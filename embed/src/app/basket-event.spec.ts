import { describe, expect, it } from 'vitest';
import type { KitDesign } from './api-types.js';
import { ADD_TO_BASKET_EVENT, addToBasketEvent, basketDetail } from './basket-event.js';

describe('the add-to-basket event', () => {
  it('carries only SKU, quantity and unit price of each cart line, and the currency', () => {
    const design = { cart: [{ sku: 'HL-S24-10', quantity: 3, unitPrice: 39, extra: 'x' }] } as unknown as KitDesign;
    expect(basketDetail(design, 'EUR')).toEqual({ lines: [{ sku: 'HL-S24-10', quantity: 3, unitPrice: 39 }], currency: 'EUR' });
  });

  it('bubbles out of a shadow root to the page', () => {
    const host = document.createElement('div');
    const inner = document.createElement('span');
    host.attachShadow({ mode: 'open' }).append(inner);
    document.body.append(host);
    const seen: Event[] = [];
    document.addEventListener(ADD_TO_BASKET_EVENT, (e) => seen.push(e), { once: true });
    inner.dispatchEvent(addToBasketEvent({ lines: [], currency: 'EUR' }));
    expect(seen).toHaveLength(1);
    expect(seen[0]!.target).toBe(host); // retargeted to the element the page sees
    host.remove();
  });
});
