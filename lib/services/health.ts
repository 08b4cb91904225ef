import "server-only";
import { pingDatabase } from "@/db/queries/health";

/** Whether the database answers, and which kind it is; throws when it does not answer. */
export const checkHealth = () => pingDatabase();
