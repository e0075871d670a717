import { describe, expect, it } from 'vitest';
import { parseStripeForm } from '../../../fakes/stripe/form';

// Stripe's API reference ("Form-encoded requests", and the curl examples of Checkout Sessions)
// writes nested parameters as bracketed keys: line_items[0][price]=…, metadata[key]=…, expand[]=….
describe('payments fake: form bodies as the Stripe API takes them', () => {
  it('nests bracketed keys into objects and numbered ones into arrays, values as strings', () => {
    const body = [
      'mode=subscription',
      'line_items[0][price]=price_team',
      'line_items[0][quantity]=3',
      'line_items[1][price_data][recurring][interval]=month',
      'subscription_data[metadata][workspace_id]=12',
      'expand[]=line_items',
      'expand[]=subscription',
      `success_url=${encodeURIComponent('https://rotaloom.test/billing?session={CHECKOUT_SESSION_ID}&x=é')}`,
    ].join('&');
    expect(parseStripeForm(body)).toEqual({
      mode: 'subscription',
      line_items: [{ price: 'price_team', quantity: '3' }, { price_data: { recurring: { interval: 'month' } } }],
      subscription_data: { metadata: { workspace_id: '12' } },
      expand: ['line_items', 'subscription'],
      success_url: 'https://rotaloom.test/billing?session={CHECKOUT_SESSION_ID}&x=é',
    });
  });

  it('reads percent-encoded brackets the same as bare ones (the API accepts both)', () => {
    expect(parseStripeForm('metadata%5Bplan%5D=team&items%5B0%5D%5Bprice%5D=p1')).toEqual({ metadata: { plan: 'team' }, items: [{ price: 'p1' }] });
  });

  it('never writes onto Object.prototype', () => {
    const parsed = parseStripeForm('__proto__[polluted]=yes&constructor[prototype][polluted]=yes&a=1');
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
    expect(parsed.a).toBe('1');
  });
});
