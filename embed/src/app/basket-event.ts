import type { CartLine, KitDesign } from './api-types.js';

/** The DOM event a shop's page listens for (api-contract.md, "Embed"). */
export const ADD_TO_BASKET_EVENT = 'treadwise-add-to-basket';

export interface AddToBasketDetail {
  lines: CartLine[];
  currency: string;
}

/** The lines a shop's basket takes: only what it needs, copied so the page cannot change our state. */
export function basketDetail(design: KitDesign, currency: string): AddToBasketDetail {
  return { lines: design.cart.map(({ sku, quantity, unitPrice }) => ({ sku, quantity, unitPrice })), currency };
}

/** Bubbles and leaves the shadow root (composed), so a listener on the page or the element sees it. */
export function addToBasketEvent(detail: AddToBasketDetail): CustomEvent<AddToBasketDetail> {
  return new CustomEvent(ADD_TO_BASKET_EVENT, { bubbles: true, composed: true, cancelable: false, detail });
}
