import { startMailFake, type MailFake } from './mail/smtp-fake';

export interface Fakes {
  mail: MailFake;
  stop(): Promise<void>;
}

/** Starts every local stand-in for a hosted service, on loopback. */
export async function startFakes(options: { mailSmtpPort?: number; mailHttpPort?: number } = {}): Promise<Fakes> {
  const mail = await startMailFake({ smtpPort: options.mailSmtpPort, httpPort: options.mailHttpPort });
  return {
    mail,
    async stop() {
      await mail.stop();
    },
  };
}
