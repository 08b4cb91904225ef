import "server-only";
import type { Actor } from "./access";

/**
 * STUB on branch h/g2 only: helper E writes the real service (in use / out of use from the
 * schedule and the latest confirmed results). Periodic-test sign-off calls it with this exact
 * signature; merging E's file replaces this one.
 */
export async function refreshSterilizerStatus(_input: { sterilizerId: string; actor?: Actor; cause: string }): Promise<void> {}
