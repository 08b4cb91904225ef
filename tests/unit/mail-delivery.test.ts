// The outbox's retry policy and configuration: Papin's own policy (constructed definition tests).
import { afterEach, describe, expect, it } from "vitest";
import { MAX_MAIL_ATTEMPTS, mailTransport, retryDelayMs } from "@/lib/mail/delivery";

const saved = { ...process.env };
afterEach(() => {
  for (const k of ["RESEND_API_KEY", "RESEND_BASE_URL", "PAPIN_MAIL_FROM"]) {
    if (saved[k] === undefined) delete process.env[k];
    else process.env[k] = saved[k];
  }
});

describe("retry delays", () => {
  it("double from one minute: 1, 2, 4, 8, 16, 32, 64 minutes", () => {
    expect([1, 2, 3, 4, 5, 6, 7].map((n) => retryDelayMs(n) / 60_000)).toEqual([1, 2, 4, 8, 16, 32, 64]);
  });

  it("never exceed two hours", () => {
    expect(retryDelayMs(30)).toBe(2 * 60 * 60_000);
  });

  it("stop after eight attempts", () => {
    expect(MAX_MAIL_ATTEMPTS).toBe(8);
  });
});

describe("mail transport", () => {
  it("is not configured without RESEND_API_KEY and RESEND_BASE_URL", () => {
    delete process.env.RESEND_API_KEY;
    delete process.env.RESEND_BASE_URL;
    expect(mailTransport().configured).toBe(false);
  });

  it("uses a development key for the local fake when only RESEND_BASE_URL is set", () => {
    delete process.env.RESEND_API_KEY;
    process.env.RESEND_BASE_URL = "http://127.0.0.1:3025";
    expect(mailTransport()).toMatchObject({ configured: true, apiKey: "re_dev_fake", baseUrl: "http://127.0.0.1:3025" });
  });

  it("goes to Resend itself with only RESEND_API_KEY, from PAPIN_MAIL_FROM", () => {
    process.env.RESEND_API_KEY = "re_live_example";
    delete process.env.RESEND_BASE_URL;
    process.env.PAPIN_MAIL_FROM = "Sterile Services <papin@marlow-bridge.example>";
    expect(mailTransport()).toMatchObject({ configured: true, apiKey: "re_live_example", baseUrl: undefined, from: "Sterile Services <papin@marlow-bridge.example>" });
  });
});
