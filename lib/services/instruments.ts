import "server-only";
import type { Instrument } from "@/db/schema";
import type { Actor } from "@/db/queries/users";
import { getInstrumentForSite } from "@/db/queries/catalog";
import {
  clearInstrumentMapping,
  findCertificate,
  findInstrumentBySerial,
  insertCertificate,
  insertInstrument,
  listCertificatesOfInstrument,
  listInstrumentsWithCertificates,
  listRecentCyclesOfInstrument,
} from "@/db/queries/instruments";
import { can } from "@/lib/auth/permissions";
import { AppError } from "@/lib/errors";
import { calibrationState, latestCertificate } from "@/lib/periodic-tests";
import { auditActor, getSiteContext, siteIdOf } from "./site";

function withoutMapping(i: Instrument) {
  const { savedMapping, ...rest } = i;
  return { ...rest, hasSavedMapping: savedMapping !== null && savedMapping !== undefined };
}

export async function listInstruments({ actor }: { actor: Actor }) {
  const siteId = siteIdOf(actor);
  const [{ rows, certificates }, { today }] = await Promise.all([listInstrumentsWithCertificates({ siteId }), getSiteContext({ actor })]);
  return rows.map((i) => {
    const latest = latestCertificate(certificates.filter((c) => c.instrumentId === i.id));
    return { ...withoutMapping(i), latestCertificate: latest, calibration: calibrationState(latest?.dueOn, today) };
  });
}

/** The instruments page: every instrument, how many in use need attention, and whether the actor may add one. */
export async function getInstrumentsPage({ actor }: { actor: Actor }) {
  const rows = await listInstruments({ actor });
  const attention = rows.filter((r) => r.active && r.calibration.state !== "valid").length;
  return { rows, attention, mayManage: can(actor.role, "equipment:manage") };
}

/** An instrument of the actor's site; any other is "not found" (404). */
async function getInstrument(actor: Actor, id: string) {
  siteIdOf(actor);
  const row = await getInstrumentForSite({ actor, id });
  if (!row) throw new AppError(404, "That instrument was not found on your site.");
  return row;
}

export async function getInstrumentPage({ actor, id }: { actor: Actor; id: string }) {
  const row = await getInstrument(actor, id);
  const [certificates, recentCycles, { today, timeZone }] = await Promise.all([
    listCertificatesOfInstrument({ instrumentId: id }),
    listRecentCyclesOfInstrument({ siteId: row.siteId, instrumentId: id, limit: 8 }),
    getSiteContext({ actor }),
  ]);
  const latest = latestCertificate(certificates);
  return {
    instrument: { ...withoutMapping(row), savedMapping: row.savedMapping },
    certificates,
    latest,
    calibration: calibrationState(latest?.dueOn, today),
    recentCycles,
    today,
    timeZone,
    mayManage: can(actor.role, "equipment:manage"),
  };
}

export async function createInstrument({ actor, input }: { actor: Actor; input: { name: string; serialNumber: string; kind: Instrument["kind"]; channelCount: number | null } }) {
  const siteId = siteIdOf(actor);
  const clash = await findInstrumentBySerial({ siteId, serialNumber: input.serialNumber });
  if (clash) throw new AppError(409, `The serial number ${input.serialNumber} already belongs to “${clash.name}”.`, "serialNumber");
  return insertInstrument({ values: { ...input, siteId }, audit: { ...auditActor(actor), action: "instrument.create", newValue: input } });
}

export async function addCalibrationCertificate({
  actor,
  input,
}: {
  actor: Actor;
  input: { instrumentId: string; certificateNumber: string; issuedBy: string; calibratedOn: string; dueOn: string; uncertaintyK: number | null; notes: string | null };
}) {
  const instrument = await getInstrument(actor, input.instrumentId);
  if (await findCertificate({ instrumentId: instrument.id, certificateNumber: input.certificateNumber })) {
    throw new AppError(409, `Certificate ${input.certificateNumber} is already recorded for this instrument.`, "certificateNumber");
  }
  return insertCertificate({ values: input, audit: { ...auditActor(actor), action: "calibration.add" } });
}

export async function clearSavedMapping({ actor, instrumentId, reason }: { actor: Actor; instrumentId: string; reason: string }) {
  const instrument = await getInstrument(actor, instrumentId);
  if (instrument.savedMapping === null || instrument.savedMapping === undefined) throw new AppError(409, "This instrument has no saved channel mapping.");
  await clearInstrumentMapping({
    siteId: instrument.siteId,
    id: instrumentId,
    audit: { ...auditActor(actor), action: "instrument.mapping-cleared", oldValue: { savedMapping: instrument.savedMapping }, newValue: { savedMapping: null }, reason },
  });
}
