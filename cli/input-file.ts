import { parse as parseYaml } from 'yaml';
import { CliError, EXIT } from './errors.js';
import { readInput, type CliIo } from './io.js';

/** A JSON or YAML document from a file or stdin (`-`); YAML 1.2 reads JSON too. */
export async function readDocument(io: CliIo, file: string): Promise<unknown> {
  const name = file === '-' ? 'stdin' : file;
  const text = await readInput(io, file);
  if (!text.trim()) throw new CliError(`${name} is empty`, EXIT.usage);
  try {
    return parseYaml(text, { prettyErrors: true, uniqueKeys: true });
  } catch (err) {
    const first = (err as Error).message.split('\n')[0];
    throw new CliError(`${name} is not valid JSON or YAML: ${first}`, EXIT.usage);
  }
}

type Plain = Record<string, unknown>;
const isPlain = (v: unknown): v is Plain => typeof v === 'object' && v !== null && !Array.isArray(v);

/** `over` laid on `base`, object by object (arrays and values replace). */
export function deepMerge(base: unknown, over: Plain): Plain {
  const out: Plain = isPlain(base) ? { ...base } : {};
  for (const [key, value] of Object.entries(over)) {
    if (value === undefined) continue;
    out[key] = isPlain(value) ? deepMerge(out[key], value) : value;
  }
  return out;
}
