/**
 * Decodes a form body as the stripe SDK encodes it (`line_items[0][price]=…&metadata[k]=v&expand[0]=x`)
 * into nested objects; keys that are all array indices become arrays. Values stay strings, as on the wire.
 */
export type FormValue = string | FormValue[] | { [key: string]: FormValue };

export function parseStripeForm(body: string): Record<string, FormValue> {
  const root: Record<string, unknown> = {};
  for (const [rawKey, value] of new URLSearchParams(body)) {
    const m = /^([^[\]]+)((?:\[[^[\]]*\])*)$/.exec(rawKey);
    if (!m) continue;
    const path = [m[1], ...[...m[2].matchAll(/\[([^[\]]*)\]/g)].map((x) => x[1])];
    let node = root as Record<string, unknown>;
    path.forEach((key, i) => {
      // `a[]=x` appends.
      const k = key === '' ? String(Object.keys(node).length) : key;
      if (i === path.length - 1) node[k] = value;
      else {
        if (typeof node[k] !== 'object' || node[k] === null) node[k] = {};
        node = node[k] as Record<string, unknown>;
      }
    });
  }
  return toArrays(root) as Record<string, FormValue>;
}

function toArrays(v: unknown): unknown {
  if (typeof v !== 'object' || v === null) return v;
  const o = v as Record<string, unknown>;
  const keys = Object.keys(o);
  const converted = Object.fromEntries(keys.map((k) => [k, toArrays(o[k])]));
  if (keys.length > 0 && keys.every((k) => /^\d+$/.test(k))) {
    return keys.sort((a, b) => Number(a) - Number(b)).map((k) => converted[k]);
  }
  return converted;
}

/** A form value read as a plain string (or undefined when absent or nested). */
export const str = (v: FormValue | undefined): string | undefined => (typeof v === 'string' ? v : undefined);
export const obj = (v: FormValue | undefined): Record<string, FormValue> => (v && typeof v === 'object' && !Array.isArray(v) ? v : {});
export const arr = (v: FormValue | undefined): FormValue[] => (Array.isArray(v) ? v : v && typeof v === 'object' ? Object.values(v) : []);
export const strings = (v: FormValue | undefined): Record<string, string> =>
  Object.fromEntries(Object.entries(obj(v)).filter((e): e is [string, string] => typeof e[1] === 'string'));
