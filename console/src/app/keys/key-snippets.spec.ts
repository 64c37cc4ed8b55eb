import { describe, expect, it } from 'vitest';

import { KEY_PLACEHOLDER, keySnippets } from './key-snippets.js';

describe('keySnippets', () => {
  it('puts the key and the API address into both calls', () => {
    const token = 'tw_server_q7m2x4kd9fhp_secret';
    const { curl, fetch } = keySnippets('http://localhost:3000/', 'server', token);
    expect(curl).toContain('curl -s http://localhost:3000/v1/calculations/voltage-drop');
    expect(curl).toContain(`Authorization: Bearer ${token}`);
    expect(fetch).toContain(`Authorization: 'Bearer ${token}'`);
    expect(curl).not.toContain('Origin:');
  });

  it('sends an embed key from one of its origins', () => {
    const { curl } = keySnippets('http://localhost:3000', 'embed', 'tw_embed_x_y', 'https://shop.harborlane.test');
    expect(curl).toContain("-H 'Origin: https://shop.harborlane.test'");
  });

  it('uses a shell variable when the key is no longer known', () => {
    const { curl } = keySnippets('http://localhost:3000', 'server');
    expect(curl).toContain(`"Authorization: Bearer ${KEY_PLACEHOLDER}"`); // double quotes: the shell expands it
  });

  it('gives a body the voltage-drop route accepts', () => {
    const { curl } = keySnippets('http://localhost:3000', 'server');
    const body = JSON.parse(/-d '(.*)'$/m.exec(curl)![1]!) as Record<string, unknown>;
    // Field names of POST /v1/calculations/voltage-drop (../shared/handbook/api-contract.md).
    expect(Object.keys(body).sort()).toEqual(['conductor', 'currentA', 'lengthM', 'supplyVoltageV']);
  });
});
