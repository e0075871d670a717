import { startMailFake, type MailFake } from './mail/smtp-fake';
import { startGoogleFake, type GoogleFake } from './google/oauth-fake';
import { startStripeFake, type StripeFake } from './stripe/stripe-fake';

export interface Fakes {
  mail: MailFake;
  google: GoogleFake;
  /** Payments; set `stripe.webhookUrl` once the app's address is known. */
  stripe: StripeFake;
  stop(): Promise<void>;
}

/** Starts every local stand-in for a hosted service, on loopback. */
export async function startFakes(options: { mailSmtpPort?: number; mailHttpPort?: number; googlePort?: number; stripePort?: number; stripeWebhookUrl?: string } = {}): Promise<Fakes> {
  const mail = await startMailFake({ smtpPort: options.mailSmtpPort, httpPort: options.mailHttpPort });
  const google = await startGoogleFake({ port: options.googlePort });
  const stripe = await startStripeFake({ port: options.stripePort, webhookUrl: options.stripeWebhookUrl });
  return {
    mail,
    google,
    stripe,
    async stop() {
      await mail.stop();
      await google.stop();
      await stripe.stop();
    },
  };
}

/**
 * Environment variables pointing the server at the fakes, for each service the given environment
 * does not configure for real (real credentials always win).
 */
export function fakeEnv(fakes: Fakes, env: Record<string, string | undefined> = process.env): Record<string, string> {
  return {
    ...(env.ROTALOOM_SMTP_HOST
      ? {}
      : { ROTALOOM_SMTP_HOST: '127.0.0.1', ROTALOOM_SMTP_PORT: String(fakes.mail.smtpPort), ROTALOOM_MAIL_FAKE_URL: `http://127.0.0.1:${fakes.mail.httpPort}` }),
    ...(env.ROTALOOM_GOOGLE_CLIENT_ID ? {} : fakes.google.env),
    ...(env.ROTALOOM_STRIPE_SECRET_KEY ? {} : fakes.stripe.env),
  };
}
