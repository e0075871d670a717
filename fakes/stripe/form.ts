import qs from 'qs';

/**
 * Decodes a form body as the stripe SDK encodes it (`line_items[0][price]=…&metadata[k]=v&expand[0]=x`)
 * into nested objects and arrays with `qs`, whose bracket format the SDK's encoder writes. Values stay
 * strings, as on the wire.
 */
export type FormValue = string | FormValue[] | { [key: string]: FormValue };

export function parseStripeForm(body: string): Record<string, FormValue> {
  return qs.parse(body, {
    // Stripe nests up to price_data[recurring][interval] under line_items[n]; qs stops at 5 levels.
    depth: 10,
    // Longer lists (expand[], line_items[]) stay arrays; past the limit qs would make an object.
    arrayLimit: 100,
    // A key like __proto__[x] is dropped, never written onto Object.prototype.
    allowPrototypes: false,
  }) as Record<string, FormValue>;
}

/** A form value read as a plain string (or undefined when absent or nested). */
export const str = (v: FormValue | undefined): string | undefined => (typeof v === 'string' ? v : undefined);
export const obj = (v: FormValue | undefined): Record<string, FormValue> => (v && typeof v === 'object' && !Array.isArray(v) ? v : {});
export const arr = (v: FormValue | undefined): FormValue[] => (Array.isArray(v) ? v : v && typeof v === 'object' ? Object.values(v) : []);
export const strings = (v: FormValue | undefined): Record<string, string> =>
  Object.fromEntries(Object.entries(obj(v)).filter((e): e is [string, string] => typeof e[1] === 'string'));
