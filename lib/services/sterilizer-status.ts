import "server-only";
import type { Actor } from "./access";

/**
 * STUB on branch h/f: helper E writes the real service (recomputes the sterilizer's in use / out of use status after a
 * confirmed outcome, records and mails a change). The lead keeps E's version of this file.
 */
export async function refreshSterilizerStatus(_input: { sterilizerId: string; actor?: Actor; cause: string }): Promise<void> {}
