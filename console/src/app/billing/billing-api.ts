import { HttpClient, type HttpResponse } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';

import type { BillingOverview, CheckoutResult, InvoiceList, PaymentDetailsLink } from '../core/api-types.js';

/** Enough for a year of monthly invoices and the odd change of plan. */
const INVOICE_PAGE = 24;

/** The organisation's plan, usage, plans on offer and invoices, through /v1/billing. */
@Injectable({ providedIn: 'root' })
export class BillingApi {
  private readonly http = inject(HttpClient);

  /** The whole response: while a payment is being confirmed, a Retry-After says when to ask again. */
  overview(): Observable<HttpResponse<BillingOverview>> {
    return this.http.get<BillingOverview>('/v1/billing', { observe: 'response' });
  }

  /** A hosted checkout to pay for the plan, or the subscription in place moved to it. */
  checkout(planId: string): Observable<CheckoutResult> {
    return this.http.post<CheckoutResult>('/v1/billing/checkout', { planId });
  }

  /** Ends the subscription at the period's end; the organisation is back on Free then. */
  cancel(): Observable<void> {
    return this.http.post<void>('/v1/billing/cancel', null);
  }

  /** The provider's page for a new card; an unpaid invoice is paid with it. */
  paymentDetails(): Observable<PaymentDetailsLink> {
    return this.http.post<PaymentDetailsLink>('/v1/billing/payment-details', null);
  }

  invoices(): Observable<InvoiceList> {
    return this.http.get<InvoiceList>('/v1/billing/invoices', { params: { limit: INVOICE_PAGE } });
  }
}
