import { readdirSync, readFileSync, statSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';

// Layers only import downward: shared/tables ← shared/schemas ← shared/sizing ← api, cli, console.
const root = path.resolve(import.meta.dirname, '../..');

function sources(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const full = path.join(dir, name);
    return statSync(full).isDirectory() ? sources(full) : full.endsWith('.ts') ? [full] : [];
  });
}

/** Every relative import of a file, resolved to a path inside the repository. */
function importsOf(file: string): string[] {
  const text = readFileSync(file, 'utf8');
  return [...text.matchAll(/(?:from|import)\s+'(\.[^']+)'/g)].map((m) => path.relative(root, path.resolve(path.dirname(file), m[1])));
}

function offending(layer: string, forbidden: string[]): string[] {
  return sources(path.join(root, layer)).flatMap((file) =>
    importsOf(file)
      .filter((target) => forbidden.some((f) => target.startsWith(f)))
      .map((target) => `${path.relative(root, file)} → ${target}`),
  );
}

describe('layering', () => {
  it('keeps the reference tables below everything', () => {
    expect(offending('shared/tables', ['shared/schemas', 'shared/sizing', 'api', 'cli', 'console'])).toEqual([]);
  });

  it('keeps the schemas below the engine', () => {
    expect(offending('shared/schemas', ['shared/sizing', 'api', 'cli', 'console'])).toEqual([]);
  });

  it('keeps the engine free of the server, the CLI and the console', () => {
    expect(offending('shared/sizing', ['api', 'cli', 'console'])).toEqual([]);
  });

  it('keeps the embeddable estimator on shared code and the generated API types only', () => {
    expect(offending('embed', ['api', 'cli', 'console'])).toEqual([]);
  });

  it('lets the estimate schema import its examples but not the other way round', () => {
    expect(importsOf(path.join(root, 'shared/schemas/estimate-examples.ts'))).toEqual([]);
  });
});
