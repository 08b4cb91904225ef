import { z } from "zod";
import { CYCLE_STATUSES, VERDICTS } from "@/lib/domain";

const isoDate = z
  .string()
  .trim()
  .regex(/^\d{4}-\d{2}-\d{2}(T[\d:.]+Z?)?$/, "Use a date like 2026-11-30.");

export const cycleListQuerySchema = z.object({
  status: z.enum(CYCLE_STATUSES, { message: `status must be one of ${CYCLE_STATUSES.join(", ")}.` }).optional(),
  verdict: z.enum(VERDICTS, { message: "verdict must be pass or fail." }).optional(),
  sterilizer: z.string().trim().min(1).optional(),
  from: isoDate.optional(),
  to: isoDate.optional(),
  q: z.string().trim().max(100).optional(),
  page: z.coerce.number({ message: "page must be a number." }).int().min(1).max(100000).optional(),
  pageSize: z.coerce.number({ message: "pageSize must be a number." }).int().min(1).max(1000).optional(),
  sort: z
    .string()
    .regex(/^(startedAt|createdAt|cycleNumber|status|verdict|sterilizer|submittedAt):(asc|desc)$/, "sort looks like startedAt:desc.")
    .optional(),
});

export const seriesQuerySchema = z.object({
  from: z.coerce.number({ message: "from must be seconds since the first sample." }).finite().optional(),
  to: z.coerce.number({ message: "to must be seconds since the first sample." }).finite().optional(),
  points: z.coerce.number({ message: "points must be a number." }).int().min(50).max(20000).optional(),
});

/** Reads URLSearchParams into an object, dropping empty values. */
export function queryObject(url: string) {
  const out: Record<string, string> = {};
  for (const [k, v] of new URL(url).searchParams) if (v !== "") out[k] = v;
  return out;
}
