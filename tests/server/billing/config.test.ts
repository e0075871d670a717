import { describe, expect, it } from 'vitest';
import { readEnv } from '../../../server/env';
import { createStripe } from '../../../server/billing/stripe-client';
import { fakeEnv } from '../../../fakes';
import { PLANS, planForStatus, monthlyPrice } from '../../../shared/billing/plans';

describe('payments configuration', () => {
  it('points the SDK at the fake when host, port and protocol are set, and at the real service otherwise', () => {
    const fake = readEnv({ NODE_ENV: 'test', ROTALOOM_STRIPE_SECRET_KEY: 'sk_test_x', ROTALOOM_STRIPE_WEBHOOK_SECRET: 'whsec_x', ROTALOOM_STRIPE_HOST: '127.0.0.1', ROTALOOM_STRIPE_PORT: '4242', ROTALOOM_STRIPE_PROTOCOL: 'http' });
    const toFake = createStripe(fake.billing!);
    expect([toFake.getApiField('host'), toFake.getApiField('port'), toFake.getApiField('protocol')]).toEqual(['127.0.0.1', 4242, 'http']);
    // Real keys and no host: the SDK's own defaults (api.stripe.com over https, per the stripe package).
    const real = readEnv({ NODE_ENV: 'test', ROTALOOM_STRIPE_SECRET_KEY: 'sk_live_x', ROTALOOM_STRIPE_WEBHOOK_SECRET: 'whsec_x' });
    const toReal = createStripe(real.billing!);
    expect([toReal.getApiField('host'), toReal.getApiField('protocol')]).toEqual(['api.stripe.com', 'https']);
    // No keys: billing is off (the API says so; limits still hold).
    expect(readEnv({ NODE_ENV: 'test' }).billing).toBeNull();
  });

  it('real credentials in the environment win over the fake', () => {
    const fakes = { stripe: { env: { ROTALOOM_STRIPE_SECRET_KEY: 'sk_test_fake' } }, google: { env: {} } } as unknown as Parameters<typeof fakeEnv>[0];
    expect(fakeEnv(fakes, { ROTALOOM_SMTP_HOST: 'smtp.example', ROTALOOM_GOOGLE_CLIENT_ID: 'x' })).toEqual({ ROTALOOM_STRIPE_SECRET_KEY: 'sk_test_fake' });
    expect(fakeEnv(fakes, { ROTALOOM_SMTP_HOST: 'smtp.example', ROTALOOM_GOOGLE_CLIENT_ID: 'x', ROTALOOM_STRIPE_SECRET_KEY: 'sk_live_real' })).toEqual({});
  });

  it('states drive the plan as the issue says: trialing, active and past_due are the team plan; canceled is free', () => {
    expect(['trialing', 'active', 'past_due', 'canceled', 'none'].map((s) => planForStatus(s as never))).toEqual(['team', 'team', 'team', 'free', 'free']);
    expect(PLANS.free.limits).toEqual({ people: 12, activeRosters: 1 });
    expect(PLANS.team.trialDays).toBe(14);
    expect(monthlyPrice(18)).toBe(18 * PLANS.team.seatPrice!.amount);
  });
});
