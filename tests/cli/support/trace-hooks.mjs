// Module hooks of trace-imports.mjs (they run on the loader thread).
import { appendFileSync } from 'node:fs';

let file = null;
export function initialize(data) {
  file = data?.file ?? null;
}
export async function resolve(specifier, context, next) {
  const r = await next(specifier, context);
  if (file) appendFileSync(file, `${r.url}\n`);
  return r;
}
