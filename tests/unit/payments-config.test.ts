import { describe, expect, it } from 'vitest';
import { ConfigError, loadConfig } from '../../api/config.js';

describe('payment provider configuration', () => {
  it('is absent without keys, so the server simulates payments', () => {
    expect(loadConfig({}).payments).toBeUndefined();
  });

  it('takes the key, the webhook secret and an optional API address together', () => {
    const config = loadConfig({ PAYMENTS_SECRET_KEY: 'sk_test_abcdefgh123', PAYMENTS_WEBHOOK_SECRET: 'whsec_abcdefgh123', PAYMENTS_API_URL: 'http://127.0.0.1:12111' });
    expect(config.payments).toEqual({ secretKey: 'sk_test_abcdefgh123', webhookSecret: 'whsec_abcdefgh123', apiUrl: 'http://127.0.0.1:12111' });
  });

  it('refuses a key without its webhook secret (events could not be verified) and malformed values', () => {
    expect(() => loadConfig({ PAYMENTS_SECRET_KEY: 'sk_test_abcdefgh123' })).toThrow(/PAYMENTS_WEBHOOK_SECRET: set PAYMENTS_SECRET_KEY and PAYMENTS_WEBHOOK_SECRET together/);
    expect(() => loadConfig({ PAYMENTS_SECRET_KEY: 'pk_test_abcdefgh123', PAYMENTS_WEBHOOK_SECRET: 'whsec_abcdefgh123' })).toThrow(ConfigError);
    expect(() => loadConfig({ PAYMENTS_SECRET_KEY: 'sk_test_abcdefgh123', PAYMENTS_WEBHOOK_SECRET: 'whsec_abcdefgh123', PAYMENTS_API_URL: 'ftp://x' })).toThrow(/PAYMENTS_API_URL/);
  });
});
