import { readFileSync, writeFileSync } from 'node:fs';
import { estimateRequestSchema } from '../shared/schemas/estimate.js';
import { alderRowTownhouse, alderRowTownhouseResponse as old } from '../shared/schemas/estimate-examples.js';
import { estimate } from '../shared/sizing/estimate/estimate.js';
const r = estimate(estimateRequestSchema.parse(alderRowTownhouse)) as any;
const o = old as any;
const quantities: string[] = o.trace.map((t: any) => t.quantity);
const out: any = {};
for (const key of Object.keys(r)) {
  if (key === 'treads') out.treads = o.treads.map((row: any) => r.treads[row.index - 1]);
  else if (key === 'outputs') out.outputs = { ...r.outputs, cv: r.outputs.cv.slice(0, o.outputs.cv.length) };
  else if (key === 'trace') out.trace = quantities.map((q) => r.trace.find((t: any) => t.quantity === q)).filter(Boolean);
  else out[key] = r[key];
}
const file = 'shared/schemas/estimate-examples.ts';
const src = readFileSync(file, 'utf8');
const start = src.indexOf('export const alderRowTownhouseResponse = {');
const end = src.indexOf('\n};\n', start) + 4;
function lit(v: any, ind: string): string {
  if (v === null) return 'null';
  if (typeof v === 'string') return "'" + v.replace(/\\/g, '\\\\').replace(/'/g, "\\'") + "'";
  if (typeof v !== 'object') return String(v);
  const inner = ind + '  ';
  if (Array.isArray(v)) {
    if (v.length === 0) return '[]';
    const flat = '[' + v.map((x) => lit(x, inner)).join(', ') + ']';
    if (!v.some((x) => x !== null && typeof x === 'object') && flat.length + ind.length < 110) return flat;
    return '[\n' + v.map((x) => inner + lit(x, inner)).join(',\n') + ',\n' + ind + ']';
  }
  const keys = Object.keys(v);
  if (keys.length === 0) return '{}';
  const key = (k: string) => (/^[A-Za-z_$][\w$]*$/.test(k) ? k : "'" + k + "'");
  const flat = '{ ' + keys.map((k) => key(k) + ': ' + lit(v[k], inner)).join(', ') + ' }';
  if (!keys.some((k) => v[k] !== null && typeof v[k] === 'object' && Object.keys(v[k]).length > 0) && flat.length + ind.length < 110) return flat;
  return '{\n' + keys.map((k) => inner + key(k) + ': ' + lit(v[k], inner)).join(',\n') + ',\n' + ind + '}';
}
const body = 'export const alderRowTownhouseResponse = ' + lit(out, '') + ';\n';
writeFileSync(file, src.slice(0, start) + body + src.slice(end));
