import type { EmbedManifest } from '../embed/bundle.js';

/** What the shop page needs from the API process; known only once the API listens. */
export interface ShopPageConfig {
  apiOrigin: string;
  /** Harbor Lane's page key; undefined when this start does not know it (see shop-key.ts). */
  embedKey: string | undefined;
  manifest: EmbedManifest | undefined;
}

const escapeHtml = (s: string) => s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

/**
 * Fills the product page's two tags: the shop pastes the versioned script with its SRI hash and
 * the element with its key. The page stays free of inline script, so its CSP can be strict.
 */
export function renderShopPage(template: string, config: ShopPageConfig, nonce: string): string {
  const notices: string[] = [];
  if (!config.embedKey) {
    notices.push('The demo key of this shop is not known to this start: start once with a fresh DATA_DIR (its key is printed then) to try the estimator here.');
  }
  if (!config.manifest) notices.push('The estimator script is not built: run npm run build.');
  const values: Record<string, string> = {
    SCRIPT_URL: config.manifest ? `${config.apiOrigin}${config.manifest.url}` : '',
    INTEGRITY: config.manifest?.integrity ?? '',
    EMBED_KEY: config.embedKey ?? '',
    API_ORIGIN: config.apiOrigin,
    NONCE: nonce,
  };
  return template
    .replace(/%(SCRIPT_URL|INTEGRITY|EMBED_KEY|API_ORIGIN|NONCE)%/g, (_m, name: string) => escapeHtml(values[name] ?? ''))
    .replace('%NOTICE%', notices.map((n) => `<p class="notice" role="status">${escapeHtml(n)}</p>`).join(''));
}

/**
 * The shop's own policy, as strict as a careful shop's: scripts from itself and the API only
 * (the estimator is also pinned by SRI), calls to the API only, styles by nonce in the shadow root.
 */
export function shopPagePolicy(apiOrigin: string, nonce: string): string {
  return [
    "default-src 'none'",
    `script-src 'self' ${apiOrigin}`,
    `connect-src ${apiOrigin}`,
    `style-src 'self' 'nonce-${nonce}'`,
    "img-src 'self' data:",
    "base-uri 'none'",
    "form-action 'self'",
    "frame-ancestors 'none'",
  ].join('; ');
}
