// Writes the typed client's types (npm run api-types) from the committed OpenAPI document; the CLI
// and the console import them, and tests/cli/api-types.test.ts fails when they are stale.
import { readFileSync, writeFileSync } from 'node:fs';
import { pathToFileURL } from 'node:url';
import openapiTS, { astToString } from 'openapi-typescript';

export const API_TYPES_FILE = new URL('../openapi/api-types.ts', import.meta.url);
const DOCUMENT_FILE = new URL('../openapi/openapi.json', import.meta.url);

const HEADER = '// Generated from openapi/openapi.json by `npm run api-types` (openapi-typescript). Do not edit.\n\n';

/** The types file's text for the committed document, rendered in memory. */
export async function renderApiTypes(document: object = JSON.parse(readFileSync(DOCUMENT_FILE, 'utf8'))): Promise<string> {
  const ast = await openapiTS(structuredClone(document) as Parameters<typeof openapiTS>[0], { alphabetize: false, exportType: false, defaultNonNullable: false });
  return HEADER + astToString(ast);
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  writeFileSync(API_TYPES_FILE, await renderApiTypes());
  console.log(`wrote ${API_TYPES_FILE.pathname}`);
}
