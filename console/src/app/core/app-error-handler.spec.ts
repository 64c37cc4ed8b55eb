import { OverlayContainer } from '@angular/cdk/overlay';
import { HttpErrorResponse } from '@angular/common/http';
import { ApplicationRef, ErrorHandler, provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';

import { AppErrorHandler } from './app-error-handler.js';

describe('AppErrorHandler', () => {
  beforeEach(() => {
    TestBed.configureTestingModule({
      providers: [provideZonelessChangeDetection(), { provide: ErrorHandler, useClass: AppErrorHandler }],
    });
    // The handler logs as Angular's default does; keep that out of the test output.
    vi.spyOn(console, 'error').mockImplementation(() => undefined);
  });

  afterEach(() => vi.restoreAllMocks());

  async function snackBarText(): Promise<string> {
    await TestBed.inject(ApplicationRef).whenStable();
    return TestBed.inject(OverlayContainer).getContainerElement().textContent ?? '';
  }

  it('shows the problem detail of an uncaught API error in a snackbar', async () => {
    // Invented problem+json body in the API's error shape (RFC 9457 plus code and requestId).
    const detail = 'Only owners can remove a member.';
    const error = new HttpErrorResponse({
      status: 403,
      statusText: 'Forbidden',
      error: { title: 'Forbidden', status: 403, detail, code: 'forbidden', requestId: 'req_5d07' },
    });

    TestBed.inject(ErrorHandler).handleError(error);

    expect(await snackBarText()).toContain(detail);
    expect(console.error).toHaveBeenCalled();
  });

  it('tells the user something went wrong when the error is not an API answer', async () => {
    TestBed.inject(ErrorHandler).handleError(new TypeError('cannot read properties of undefined'));
    const text = await snackBarText();
    expect(text).toContain('Something went wrong'); // the console's own wording
    expect(text).not.toContain('cannot read properties'); // stack-level wording stays in the log
  });
});
