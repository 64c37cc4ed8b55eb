import type { HttpResponse } from '@angular/common/http';

/** The file name a Content-Disposition header gives, or `fallback`. */
export function attachmentName(disposition: string | null, fallback: string): string {
  if (!disposition) return fallback;
  const encoded = /filename\*=UTF-8''([^;]+)/i.exec(disposition);
  if (encoded?.[1]) return decodeURIComponent(encoded[1]);
  const plain = /filename="?([^";]+)"?/i.exec(disposition);
  return plain?.[1]?.trim() || fallback;
}

/**
 * Saves a downloaded body as a file. Downloads go through HttpClient so the interceptor adds the
 * access token; a plain link would reach the API without it.
 */
export function saveDownload(response: HttpResponse<Blob>, fallbackName: string, doc: Document = document): string {
  const name = attachmentName(response.headers.get('Content-Disposition'), fallbackName);
  const body = response.body ?? new Blob([]);
  const url = URL.createObjectURL(body);
  const link = doc.createElement('a');
  link.href = url;
  link.download = name;
  link.rel = 'noopener';
  doc.body.appendChild(link);
  link.click();
  link.remove();
  // Revoked on the next turn: some browsers start the download only after click() returns.
  setTimeout(() => URL.revokeObjectURL(url), 0);
  return name;
}
