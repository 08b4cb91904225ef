/**
 * What the report checker shows. Each new file (chosen, dropped or refused) starts a new check and clears the previous
 * file's result and error, so a new error never sits above a stale result; an answer for an earlier file that arrives
 * late is ignored.
 */
export type VerifyOutcome =
  | { match: true; kind?: undefined; sha256: string; cycleId: string; reportNumber: string; cycleNumber: string; archivedAt: string }
  | { match: true; kind: "study-report"; sha256: string; studyId: string; studyNumber: string; reportNumber: string; archivedAt: string }
  | { match: true; kind: "audit-extract"; sha256: string; seq: number; exportedAt: string; exportedBy: string | null; events: number | null }
  | { match: false; sha256: string; problem?: string };

export type VerifyState = { check: number; name: string; busy: boolean; outcome: VerifyOutcome | null; error: string | null };

export type VerifyEvent =
  { type: "start"; name: string } | { type: "refused"; name: string; error: string } | { type: "answered"; check: number; outcome: VerifyOutcome } | { type: "failed"; check: number; error: string };

export const VERIFY_IDLE: VerifyState = { check: 0, name: "", busy: false, outcome: null, error: null };

export function verifyReducer(state: VerifyState, event: VerifyEvent): VerifyState {
  switch (event.type) {
    case "start":
      return { check: state.check + 1, name: event.name, busy: true, outcome: null, error: null };
    case "refused":
      return { check: state.check + 1, name: event.name, busy: false, outcome: null, error: event.error };
    case "answered":
      return event.check === state.check ? { ...state, busy: false, outcome: event.outcome, error: null } : state;
    case "failed":
      return event.check === state.check ? { ...state, busy: false, outcome: null, error: event.error } : state;
  }
}
