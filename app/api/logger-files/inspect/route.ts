import { NextResponse } from "next/server";
import { route } from "@/lib/http";
import { requireRole } from "@/lib/auth/guards";
import { AppError } from "@/lib/errors";
import { filesOf, readMultipart } from "@/lib/uploads";
import { inspectLoggerFile, LoggerFileError, type MappingOverrides } from "@/lib/logger-files";
import { getInstrumentForSite } from "@/db/queries/catalog";
import { sha256Hex } from "@/lib/integrity";
import type { InspectResponse } from "@/lib/cycles/contracts";

export const runtime = "nodejs";

export const POST = route(async (request) => {
  const actor = await requireRole("cycle:create", "upload logger files");
  const form = await readMultipart(request);
  const [file] = await filesOf(form, "file");
  if (!file) throw new AppError(400, "Attach the logger file in the field named file.", "file");
  const instrumentId = String(form.get("instrumentId") ?? "");
  let savedMapping: MappingOverrides | null = null;
  if (instrumentId) {
    const instrument = await getInstrumentForSite({ actor, id: instrumentId });
    if (!instrument) throw new AppError(404, "That instrument was not found on your site.", "instrumentId");
    savedMapping = (instrument.savedMapping as MappingOverrides | null) ?? null;
  }
  try {
    const warnings: string[] = [];
    let inspected;
    try {
      inspected = inspectLoggerFile(file.bytes, savedMapping ?? undefined);
    } catch (error) {
      // A saved mapping that does not fit this file (other column names) must not block the upload.
      if (!savedMapping || !(error instanceof LoggerFileError)) throw error;
      warnings.push(`The mapping saved for this instrument does not fit this file (${error.message}); the guess is shown instead.`);
      savedMapping = null;
      inspected = inspectLoggerFile(file.bytes);
    }
    warnings.push(...inspected.problems.map((p) => `${p} below.`));
    const body: InspectResponse = {
      ...inspected,
      name: file.name,
      size: file.bytes.byteLength,
      sha256: sha256Hex(file.bytes),
      warnings,
      savedMapping,
    };
    return NextResponse.json(body);
  } catch (error) {
    if (error instanceof LoggerFileError) throw new AppError(422, `${file.name}: ${error.message}`, "file");
    throw error;
  }
});
