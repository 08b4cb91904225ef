import { Document, Page, View, renderToBuffer } from "@react-pdf/renderer";
import type { AuditLine } from "@/lib/domain/audit-words";
import { plural } from "@/lib/domain";
import type { LedgerHead } from "@/lib/integrity/anchors";
import { registerReportFonts } from "./fonts";
import { ReportFooter } from "./footer";
import { Fact, Heading, T, TableHead, type Column } from "./parts";
import { s } from "./styles";
import { pdfText } from "./text";
import { colour } from "./theme";

export type AuditExtractRow = AuditLine & { hash: string };

export type AuditExtractModel = {
  siteName: string;
  timeZone: string;
  exportedBy: { name: string; role: string; email: string };
  /** both clocks, already formatted */
  exportedAt: { iso: string; site: string; utc: string };
  filterWords: string[];
  head: LedgerHead;
  rows: AuditExtractRow[];
  verifyHint: string;
};

const columns: Column[] = [
  { title: "#", width: 7, numeric: true },
  { title: "When (site / UTC)", width: 19 },
  { title: "Who", width: 16 },
  { title: "What, old › new", width: 42 },
  { title: "Why", width: 16 },
];

const cell = (width: number) => ({ width: `${width}%`, paddingVertical: 2.5, paddingHorizontal: 3 });
const changeStyle = { fontSize: 6.8, color: colour.inkSoft };
const hashStyle = { fontSize: 5.8, color: colour.inkMuted, paddingHorizontal: 3, paddingBottom: 2.5 };
// Three fixed-width parts, so the site name never runs into the page number.

function EventRow({ row }: { row: AuditExtractRow }) {
  return (
    <View style={{ borderBottomWidth: 0.5, borderBottomColor: colour.inkLine }} wrap={false}>
      <View style={{ flexDirection: "row" }}>
        <T style={[cell(7), s.mono, { textAlign: "right" }]}>{String(row.seq)}</T>
        <View style={cell(19)}>
          <T>{row.when.site}</T>
          <T style={s.small}>{row.when.utc}</T>
        </View>
        <View style={cell(16)}>
          <T>{row.who}</T>
          {row.role ? <T style={s.small}>{row.role}</T> : null}
        </View>
        <View style={cell(42)}>
          <T>{row.what}</T>
          {row.record ? <T style={s.small}>{`Record: ${row.record.label}`}</T> : null}
          {row.changes.map((c, i) => (
            <T key={i} style={changeStyle}>{`${c.field}: ${c.old ?? "—"} › ${c.new ?? "—"}`}</T>
          ))}
        </View>
        <T style={cell(16)}>{row.reason ?? "—"}</T>
      </View>
      <T style={[s.monoSmall, hashStyle]}>{`event hash ${row.hash}`}</T>
    </View>
  );
}

export function AuditExtractDocument({ model }: { model: AuditExtractModel }) {
  const { head, rows } = model;
  const filter = model.filterWords.length ? model.filterWords.join("; ") : "none: every event of the site";
  return (
    <Document
      title={pdfText(`Papin audit trail extract: ${model.siteName}, ${model.exportedAt.utc}`)}
      author="Papin"
      subject={pdfText(`${model.siteName}: audit trail, ${rows.length} events`)}
      creator="Papin"
      producer="Papin"
      language="en-GB"
      creationDate={new Date(model.exportedAt.iso)}
      modificationDate={new Date(model.exportedAt.iso)}
    >
      <Page size="A4" style={s.page}>
        <View style={s.header} fixed>
          <View style={{ flexDirection: "row", alignItems: "flex-end" }}>
            <T style={s.brand}>PAPIN</T>
            <T style={s.headerTitle}>Audit trail extract</T>
          </View>
          <T style={s.headerRight}>{model.exportedAt.utc}</T>
        </View>
        <ReportFooter reportNumber={`Extract ${model.exportedAt.utc}`} about={`Audit trail of ${model.siteName}`} />

        <View style={s.titleBlock}>
          <T style={s.title}>{`Audit trail of ${model.siteName}`}</T>
          <T style={s.subtitle}>{`${plural(rows.length, "event")}, newest first`}</T>
        </View>

        <View style={[s.facts, { marginBottom: 10 }]}>
          <Fact label="Exported by" wide>{`${model.exportedBy.name} (${model.exportedBy.role}, ${model.exportedBy.email})`}</Fact>
          <Fact label="Exported at" wide>{`${model.exportedAt.site} (${model.timeZone}) · ${model.exportedAt.utc}`}</Fact>
          <Fact label="Filter" wide>
            {filter}
          </Fact>
          <Fact label="Events in this extract" wide>
            {String(rows.length)}
          </Fact>
          <Fact label="Ledger head" wide>
            <T>{`${head.events} events in the whole ledger; the last is event ${head.lastSeq}, chain hash (SHA-256):`}</T>
            <T style={s.monoSmall}>{head.lastHash}</T>
          </Fact>
          <Fact label="How to verify" wide>
            {model.verifyHint}
          </Fact>
        </View>

        <Heading>Events</Heading>
        <View style={s.table}>
          <TableHead columns={columns} />
          {rows.length === 0 ? <T style={[s.muted, { padding: 4 }]}>No event matches this filter.</T> : rows.map((row) => <EventRow key={row.seq} row={row} />)}
        </View>
        <T style={[s.caption, { marginTop: 6 }]}>
          Each event hash is the SHA-256 of the event as written, chained to the event before it; Audit ledger in Papin recomputes the whole chain and compares it with the copies of its head kept
          outside the database.
        </T>
      </Page>
    </Document>
  );
}

/** Renders the extract; the same model gives the same bytes (dates from exportedAt), so its SHA-256 can be recorded and checked. */
export async function renderAuditExtract(model: AuditExtractModel): Promise<Buffer> {
  registerReportFonts();
  return renderToBuffer(<AuditExtractDocument model={model} />);
}
