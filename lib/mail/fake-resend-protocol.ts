/** What the local fake mail service stores and answers; shared by the fake and the portal's reader. */
export const FAKE_RESEND_SERVICE = "papin-fake-resend";

export type FakeEmail = {
  object: "email";
  id: string;
  created_at: string;
  from: string;
  to: string[];
  cc: string[] | null;
  bcc: string[] | null;
  reply_to: string[] | null;
  subject: string;
  html: string | null;
  text: string | null;
  headers: Record<string, string> | null;
  tags: Array<{ name: string; value: string }> | null;
  scheduled_at: string | null;
  last_event: "delivered";
  idempotency_key: string | null;
};
