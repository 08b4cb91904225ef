import "server-only";
import { FAKE_RESEND_SERVICE, type FakeEmail } from "./fake-resend-protocol";
import { mailTransport } from "./delivery";

export type { FakeEmail };

export type FakeMailbox =
  | { state: "not-configured" }
  /** RESEND_BASE_URL answers, but it is not Papin's fake: its mail is never read from here. */
  | { state: "not-fake"; baseUrl: string }
  | { state: "unreachable"; baseUrl: string; problem: string }
  | { state: "ok"; baseUrl: string; messages: FakeEmail[]; hasMore: boolean };

const TIMEOUT_MS = 2_000;

/**
 * The messages the local fake mail service received, newest first, read over its HTTP API.
 * Only when RESEND_BASE_URL points at a server that identifies itself as the fake.
 */
export async function readFakeMailbox({ limit = 50 }: { limit?: number } = {}): Promise<FakeMailbox> {
  const { baseUrl, apiKey } = mailTransport();
  if (!baseUrl) return { state: "not-configured" };
  const root = baseUrl.replace(/\/+$/, "");
  try {
    const health = await fetch(`${root}/_health`, { signal: AbortSignal.timeout(TIMEOUT_MS), cache: "no-store" });
    const body = (await health.json().catch(() => null)) as { service?: string } | null;
    if (!health.ok || body?.service !== FAKE_RESEND_SERVICE) return { state: "not-fake", baseUrl: root };
    const res = await fetch(`${root}/emails?limit=${Math.min(100, Math.max(1, limit))}`, {
      headers: { Authorization: `Bearer ${apiKey}` },
      signal: AbortSignal.timeout(TIMEOUT_MS),
      cache: "no-store",
    });
    const list = (await res.json()) as { data?: FakeEmail[]; has_more?: boolean; message?: string };
    if (!res.ok || !Array.isArray(list.data)) {
      return { state: "unreachable", baseUrl: root, problem: `The fake answered ${res.status}: ${list.message ?? "no message"}` };
    }
    return { state: "ok", baseUrl: root, messages: list.data, hasMore: Boolean(list.has_more) };
  } catch (error) {
    const timedOut = (error as Error).name === "TimeoutError";
    return { state: "unreachable", baseUrl: root, problem: timedOut ? `No answer within ${TIMEOUT_MS / 1000} s.` : "Nothing answers at that address." };
  }
}
