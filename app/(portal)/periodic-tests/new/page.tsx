import Link from "next/link";
import { requirePageActor } from "@/lib/auth/page-guard";
import { listSterilizerChoices } from "@/lib/services/periodic-tests";
import { EmptyState, PageHeader, Panel } from "@/components/ui/panel";
import { AirLeakageForm, BowieDickForm, DrynessForm, NonCondensableGasForm, SuperheatForm } from "@/components/periodic-tests/record-forms";
import { SafetyCaution } from "@/components/periodic-tests/safety-caution";
import { isRecordable, RECORDABLE_KINDS, type RecordableKind, testKindLabel } from "@/lib/domain";

export const metadata = { title: "Record a periodic test" };

const SHORT: Record<RecordableKind, string> = {
  "air-leakage": "Air leakage",
  "bowie-dick": "Bowie-Dick",
  "hollow-load": "Hollow load (helix)",
  "steam-non-condensable-gas": "Non-condensable gases",
  "steam-superheat": "Superheat",
  "steam-dryness": "Dryness",
};

export default async function RecordTestPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const actor = await requirePageActor("periodic-test:record");
  const raw = await searchParams;
  const kindParam = typeof raw.kind === "string" ? raw.kind : "";
  const kind: RecordableKind = isRecordable(kindParam) ? kindParam : "air-leakage";
  const sterilizerId = typeof raw.sterilizer === "string" ? raw.sterilizer : undefined;
  const { sterilizers, site } = await listSterilizerChoices({ actor });
  const props = { sterilizers, sterilizerId: sterilizers.some((s) => s.id === sterilizerId) ? sterilizerId : undefined };
  const tabHref = (k: string) => `/periodic-tests/new?kind=${k}${props.sterilizerId ? `&sterilizer=${props.sterilizerId}` : ""}`;
  return (
    <>
      <PageHeader
        title="Record a periodic test"
        subtitle="The result, its limit and basis are shown before you save. Every record goes into the audit ledger."
        actions={
          <Link href="/periodic-tests" className="btn-secondary">
            Schedule and history
          </Link>
        }
      />
      <nav aria-label="Test" className="mb-4 flex flex-wrap gap-2">
        {RECORDABLE_KINDS.map((k) => (
          <Link key={k} href={tabHref(k)} aria-current={k === kind ? "page" : undefined} className={k === kind ? "btn-primary" : "btn-secondary"}>
            {SHORT[k]}
          </Link>
        ))}
      </nav>
      <div className="grid gap-gutter xl:grid-cols-[minmax(0,1fr)_22rem]">
        <Panel title={testKindLabel(kind)}>
          {sterilizers.filter((s) => s.active).length === 0 ? (
            <EmptyState title="No sterilizer in service on this site." />
          ) : kind === "air-leakage" ? (
            <AirLeakageForm key={kind} {...props} />
          ) : kind === "bowie-dick" || kind === "hollow-load" ? (
            <BowieDickForm key={kind} kind={kind} {...props} />
          ) : kind === "steam-non-condensable-gas" ? (
            <NonCondensableGasForm key={kind} {...props} />
          ) : kind === "steam-superheat" ? (
            <SuperheatForm key={kind} {...props} site={{ atmosphereKpa: site.atmosphereKpa, altitudeM: site.altitudeM }} />
          ) : (
            <DrynessForm key={kind} {...props} />
          )}
        </Panel>
        <div className="space-y-gutter">
          <SafetyCaution kind={kind} />
          <Panel title="About this test">
            <AboutTest kind={kind} />
          </Panel>
        </div>
      </div>
    </>
  );
}

function AboutTest({ kind }: { kind: RecordableKind }) {
  const text: Record<RecordableKind, string> = {
    "air-leakage":
      "Shows that air does not leak into the chamber during the vacuum phases at a rate that would spoil steam penetration. Applies to sterilizers that use vacuum for air removal; run it before thermometric tests and stop if it fails. Readings are absolute; a leak rate is the same in gauge or absolute as long as the barometer does not move during the test.",
    "bowie-dick":
      "Shows rapid, even steam penetration of a porous test pack, usually first thing each day. A failure can come from poor air removal, a leak during air removal or non-condensable gas in the steam; it does not prove any one cause.",
    "hollow-load":
      "Shows that steam reaches the closed end of a narrow tube (the helix process challenge device) in a type B small sterilizer, usually first thing each day. A pale or uneven strip means air was not removed from the hollow load.",
    "steam-non-condensable-gas": "Air and other gases that do not condense collect in loads and block steam contact. Sampled at validation and yearly, and after the steam supply has been shut down.",
    "steam-superheat": "Superheated steam behaves like hot air and sterilizes poorly. The expanded steam may be at most 25 K above the local boiling point.",
    "steam-dryness":
      "Wet steam leaves loads damp; the dryness value shows the steam quality is acceptable. It does not measure the true moisture content. A value above 1 is impossible for wet steam and means superheat or a measurement error.",
  };
  return <p className="text-sm text-ink-soft">{text[kind]}</p>;
}
