import { startFakeResend, type FakeResend, type FakeResendOptions } from "@/lib/mail/fake-resend-server";

const MAIL_VARIABLES = ["RESEND_API_KEY", "RESEND_BASE_URL", "PAPIN_MAIL_FROM"] as const;

/**
 * Starts the fake mail service on a free port and points Papin (and the Resend SDK) at it through
 * RESEND_BASE_URL. `stop()` closes it and puts the mail variables back as they were.
 */
export async function useFakeResend(options: FakeResendOptions = {}): Promise<FakeResend & { stop(): Promise<void> }> {
  const saved = Object.fromEntries(MAIL_VARIABLES.map((k) => [k, process.env[k]]));
  const fake = await startFakeResend({ quiet: true, ...options });
  process.env.RESEND_BASE_URL = fake.url;
  process.env.RESEND_API_KEY = options.apiKey ?? "re_test_key";
  return {
    ...fake,
    async stop() {
      await fake.close().catch(() => undefined);
      for (const k of MAIL_VARIABLES) {
        if (saved[k] === undefined) delete process.env[k];
        else process.env[k] = saved[k];
      }
    },
  };
}

/** A local address where nothing listens: a mail service that is down. */
export async function deadMailServiceUrl(): Promise<string> {
  const probe = await startFakeResend({ quiet: true });
  await probe.close();
  return probe.url;
}
