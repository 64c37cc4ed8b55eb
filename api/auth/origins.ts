/**
 * Allowed origins of a embed key: exact (`https://shop.example.test`) or one wildcard
 * label at the front (`https://*.example.test`, which matches sub-domains but not the apex).
 */
const ORIGIN = /^https?:\/\/(\*\.)?[a-z0-9-]+(\.[a-z0-9-]+)*(:\d{1,5})?$/;

export function isValidOriginPattern(pattern: string): boolean {
  return ORIGIN.test(pattern);
}

export function originAllowed(origin: string, patterns: readonly string[]): boolean {
  const o = origin.toLowerCase();
  for (const p of patterns) {
    if (!p.includes('*')) {
      if (p === o) return true;
      continue;
    }
    const [scheme, rest] = p.split('://');
    const suffix = rest.slice(1); // ".example.test"
    if (o.startsWith(`${scheme}://`) && o.endsWith(suffix)) {
      const label = o.slice(scheme.length + 3, o.length - suffix.length);
      if (/^[a-z0-9-]+(\.[a-z0-9-]+)*$/.test(label)) return true;
    }
  }
  return false;
}
