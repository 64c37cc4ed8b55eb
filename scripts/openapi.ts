// Writes the committed OpenAPI document (npm run openapi); a test fails when it is stale.
import { writeFileSync } from 'node:fs';
import { openApiDocument } from '../api/openapi/spec.js';

const file = new URL('../openapi/openapi.json', import.meta.url);
writeFileSync(file, `${JSON.stringify(openApiDocument(), null, 2)}\n`);
console.log(`wrote ${file.pathname}`);
