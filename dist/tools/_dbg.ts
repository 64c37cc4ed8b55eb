import { estimateRequestSchema } from '../shared/schemas/estimate.js';
import * as ex from '../shared/schemas/estimate-examples.js';
import { estimate } from '../shared/sizing/estimate/estimate.js';
const name = process.argv[2] as keyof typeof ex;
const extra = process.argv[3] ? JSON.parse(process.argv[3]) : {};
const r = estimate(estimateRequestSchema.parse({ ...(ex as any)[name], ...extra }));
const pick = process.argv[4] ? process.argv[4].split(',') : ['summary', 'drivers', 'circuits', 'feeder', 'checks', 'bom', 'cables'];
console.log(JSON.stringify(Object.fromEntries(pick.map((k) => [k, (r as any)[k]])), null, 1));
