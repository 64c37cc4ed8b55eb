import type { EmbedManifest, KeyKind } from '../core/api-types.js';

/** Stands in for a key whose secret the console no longer knows (it is shown once only). */
export const KEY_PLACEHOLDER = '$TREADWISE_KEY';

export interface KeySnippets {
  curl: string;
  fetch: string;
}

// A small, valid voltage-drop request (the field names of /v1/calculations/voltage-drop): a quick
// way to prove a key works without touching any stored data.
const SAMPLE_BODY = { supplyVoltageV: 24, currentA: 2, lengthM: 8, conductor: { crossSectionMm2: 0.75 } };

/**
 * Ready-to-paste calls for a key. A server key goes in a shell or a server; an embed key only works
 * from a page on one of its allowed origins, so its fetch is written for the browser.
 */
export function keySnippets(apiUrl: string, kind: KeyKind, token: string = KEY_PLACEHOLDER, origin?: string): KeySnippets {
  const url = `${apiUrl.replace(/\/+$/, '')}/v1/calculations/voltage-drop`;
  const body = JSON.stringify(SAMPLE_BODY);
  const authHeader = token === KEY_PLACEHOLDER ? `"Authorization: Bearer ${token}"` : `'Authorization: Bearer ${token}'`;
  const curlLines = [
    `curl -s ${url}`,
    `  -H ${authHeader}`,
    `  -H 'Content-Type: application/json'`,
    // The API only answers an embed key from one of its origins; a browser sends the header itself.
    ...(kind === 'embed' ? [`  -H 'Origin: ${origin ?? 'https://shop.example.test'}'`] : []),
    `  -d '${body}'`,
  ];
  const fetchCall = [
    kind === 'embed' ? '// In a page served from one of the key’s allowed origins.' : '// On your server; keep the key out of browsers.',
    `const answer = await fetch('${url}', {`,
    `  method: 'POST',`,
    `  headers: { Authorization: 'Bearer ${token}', 'Content-Type': 'application/json' },`,
    `  body: JSON.stringify(${body}),`,
    `});`,
    `console.log(await answer.json());`,
  ];
  return { curl: curlLines.join(' \\\n'), fetch: fetchCall.join('\n') };
}

/** The script's moving address (always the latest build, so no SRI is possible on it). */
export const EMBED_LATEST_PATH = '/embed/v1/treadwise-estimator.js';

// Attribute values are written between double quotes; nothing in them may end the attribute or a tag.
function attribute(value: string): string {
  return value.replace(/&/g, '&amp;').replace(/"/g, '&quot;').replace(/</g, '&lt;').replace(/>/g, '&gt;');
}

/**
 * The two tags a shop pastes into a product page (docs/embed.md): the versioned script with its SRI
 * hash from the manifest, and the element. Without a manifest (the script not built on this
 * server) the script tag points at the moving copy and carries no integrity. When the console no
 * longer knows the secret, the key is written as its public prefix and an ellipsis to fill in.
 */
export function embedTags(apiUrl: string, manifest: EmbedManifest | null, key: { token?: string; keyId: string }): string {
  const base = apiUrl.replace(/\/+$/, '');
  const embedKey = key.token ?? `tw_embed_${key.keyId}_…`;
  const script = manifest
    ? [`<script src="${attribute(base + manifest.url)}"`, `        integrity="${attribute(manifest.integrity)}" crossorigin="anonymous" defer></script>`]
    : [`<script src="${attribute(base + EMBED_LATEST_PATH)}" defer></script>`];
  return [...script, `<treadwise-estimator embed-key="${attribute(embedKey)}" api-url="${attribute(base)}"></treadwise-estimator>`].join('\n');
}
