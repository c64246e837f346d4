/**
 * Form-encoded parameters as the provider's SDK sends them: `metadata[ticket]=T-1`,
 * `capabilities[transfers][requested]=true`, `expand[0]=destination`.
 */
export type Param = string | Param[] | { [key: string]: Param };
export type Params = { [key: string]: Param };

export class FormError extends Error {
  constructor(
    message: string,
    readonly param?: string,
  ) {
    super(message);
  }
}

const MAX_PAIRS = 1000;
const MAX_DEPTH = 6;
const FORBIDDEN = new Set(['__proto__', 'constructor', 'prototype']);

function splitKey(raw: string): string[] {
  const open = raw.indexOf('[');
  if (open <= 0 || !raw.endsWith(']')) return [raw];
  const segments = [raw.slice(0, open)];
  const rest = raw.slice(open);
  const re = /\[([^[\]]*)\]/g;
  let consumed = 0;
  for (let m = re.exec(rest); m; m = re.exec(rest)) {
    if (m.index !== consumed) return [raw];
    segments.push(m[1] ?? '');
    consumed = re.lastIndex;
  }
  return consumed === rest.length ? segments : [raw];
}

type Node = { [key: string]: Node | string };

function finalize(node: Node | string): Param {
  if (typeof node === 'string') return node;
  const keys = Object.keys(node);
  const isList = keys.length > 0 && keys.every((k, i) => k === String(i));
  if (isList) return keys.map((k) => finalize(node[k] as Node | string));
  const out: { [key: string]: Param } = {};
  for (const k of keys) out[k] = finalize(node[k] as Node | string);
  return out;
}

export function parseForm(body: string): Params {
  const root: Node = Object.create(null);
  let pairs = 0;
  for (const [rawKey, value] of new URLSearchParams(body)) {
    if (++pairs > MAX_PAIRS) throw new FormError('Too many parameters in the request.');
    const path = splitKey(rawKey);
    if (path.length > MAX_DEPTH) throw new FormError(`Parameter nested too deeply: ${rawKey}`, rawKey);
    if (path.some((segment) => FORBIDDEN.has(segment))) throw new FormError(`Invalid parameter: ${rawKey}`, rawKey);
    let node = root;
    for (let i = 0; i < path.length; i++) {
      let segment = path[i] as string;
      if (segment === '' && i > 0) segment = String(Object.keys(node).length);
      if (segment === '') throw new FormError(`Invalid parameter: ${rawKey}`, rawKey);
      if (i === path.length - 1) {
        if (typeof node[segment] === 'object') throw new FormError(`Invalid parameter: ${rawKey}`, rawKey);
        node[segment] = value;
        break;
      }
      const next = node[segment];
      if (typeof next === 'string') throw new FormError(`Invalid parameter: ${rawKey}`, rawKey);
      if (next === undefined) {
        const created: Node = Object.create(null);
        node[segment] = created;
        node = created;
      } else {
        node = next;
      }
    }
  }
  return finalize(root) as Params;
}

/** A stable text form of parameters, so the same request encoded in another key order still matches. */
export function canonical(value: Param | Params | undefined): string {
  if (value === undefined) return 'null';
  if (typeof value === 'string') return JSON.stringify(value);
  if (Array.isArray(value)) return `[${value.map((v) => canonical(v)).join(',')}]`;
  const keys = Object.keys(value).sort();
  return `{${keys.map((k) => `${JSON.stringify(k)}:${canonical(value[k])}`).join(',')}}`;
}
