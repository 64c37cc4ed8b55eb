import { describe, expect, it } from 'vitest';

import { attachmentName } from './file-download.js';

describe('attachmentName', () => {
  it('reads the file name the API gives in Content-Disposition', () => {
    expect(attachmentName('attachment; filename="saltmarsh-cottage-staircase-main-stair-bom-2026-12-01.csv"', 'bom.csv')).toBe(
      'saltmarsh-cottage-staircase-main-stair-bom-2026-12-01.csv',
    );
    expect(attachmentName('attachment; filename=catalog.csv', 'x.csv')).toBe('catalog.csv');
  });

  it('prefers the UTF-8 form and falls back when there is no header', () => {
    expect(attachmentName("attachment; filename=\"a.pdf\"; filename*=UTF-8''Caf%C3%A9.pdf", 'x.pdf')).toBe('Café.pdf');
    expect(attachmentName(null, 'estimate.pdf')).toBe('estimate.pdf');
  });
});
