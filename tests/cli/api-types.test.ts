import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { API_TYPES_FILE, renderApiTypes } from '../../scripts/api-types.js';

describe('the typed client', () => {
  it('is generated from the committed OpenAPI document (run `npm run api-types` when this fails)', async () => {
    // Regenerated in memory from openapi/openapi.json and compared with the committed file.
    expect(readFileSync(API_TYPES_FILE, 'utf8') === (await renderApiTypes())).toBe(true);
  });

  it('differs as soon as the document gains a field, so the check above can fail', async () => {
    const document = JSON.parse(readFileSync(new URL('../../openapi/openapi.json', import.meta.url), 'utf8'));
    document.components.schemas.Health.properties.uptimeS = { type: 'number' };
    const changed = await renderApiTypes(document);
    expect(changed).not.toBe(readFileSync(API_TYPES_FILE, 'utf8'));
    expect(changed).toContain('uptimeS?: number;');
  });
});
