import { Image, View } from "@react-pdf/renderer";
import { INDICATOR_SHEET_RESULT_LABELS, type IndicatorSheetResult } from "@/lib/domain";
import { BOWIE_DICK } from "@/lib/periodic-tests/limits";
import { Fact, Heading, T } from "./parts";
import { s } from "./styles";
import { colour } from "./theme";
import { bothClocks } from "./time";

/** What the report prints of a Bowie-Dick test: the sheet's reading and its photo; null when no sheet was recorded. */
export type BowieDickReportSheet = {
  result: IndicatorSheetResult;
  passed: boolean;
  indicatorLot: string | null;
  recordedByName: string;
  recordedAt: string;
  photo: { name: string; contentType: string; sha256: string; bytes: Uint8Array } | null;
} | null;

const box = {
  pass: { border: colour.pass500, background: colour.pass50, ink: colour.pass700, word: "PASS" },
  fail: { border: colour.fail500, background: colour.fail50, ink: colour.fail700, word: "FAIL" },
  none: { border: colour.caution500, background: colour.caution50, ink: colour.caution700, word: "NO RESULT" },
};

/**
 * The section a Bowie-Dick cycle prints instead of the thermometric findings: the verdict is the
 * indicator sheet's colour change (DOMAIN.md §2.7), never the plateau analysis of a logged file,
 * which the report still draws as information.
 */
export function BowieDickSection({ sheet, zone }: { sheet: BowieDickReportSheet; zone: string }) {
  const v = box[sheet ? (sheet.passed ? "pass" : "fail") : "none"];
  const read = sheet ? bothClocks(sheet.recordedAt, zone) : null;
  return (
    <View style={{ marginBottom: 6 }}>
      <View style={[s.verdict, { borderColor: v.border, backgroundColor: v.background }]} wrap={false}>
        <View style={s.verdictWordBox}>
          <T style={[s.verdictCaption, { color: v.ink }]}>VERDICT FROM THE INDICATOR SHEET</T>
          <T style={[s.verdictWord, { color: v.ink }, sheet ? {} : { fontSize: 18 }]}>{v.word}</T>
        </View>
        <View style={[s.verdictBody, { borderLeftColor: v.border }]}>
          <T style={s.verdictSummary}>
            {sheet
              ? sheet.passed
                ? "The indicator sheet changed colour uniformly: steam penetrated the test pack evenly."
                : "The indicator sheet did not change uniformly: steam did not penetrate the test pack evenly. Poor air removal, a leak during air removal or non-condensable gas are possible causes; the sterilizer stays out of use until a repeat test passes."
              : "No indicator sheet has been recorded for this Bowie-Dick cycle, so it has no verdict."}
          </T>
          <T style={[s.small, { marginTop: 3 }]}>{`Criterion: ${BOWIE_DICK.basis}.`}</T>
        </View>
      </View>

      <View wrap={false}>
        <Heading>Steam penetration test: the indicator sheet</Heading>
        {sheet ? (
          <View style={s.facts}>
            <Fact label="Result">{INDICATOR_SHEET_RESULT_LABELS[sheet.result]}</Fact>
            <Fact label="Indicator lot">{sheet.indicatorLot ?? "not recorded"}</Fact>
            <Fact label="Read by">{sheet.recordedByName}</Fact>
            <Fact label="Recorded (site)">{read!.site}</Fact>
            <Fact label="Photo">{sheet.photo ? sheet.photo.name : "missing"}</Fact>
            <Fact label="Photo type">{sheet.photo ? sheet.photo.contentType : "—"}</Fact>
            <Fact label="Photo SHA-256" wide>
              <T style={s.mono}>{sheet.photo ? sheet.photo.sha256 : "—"}</T>
            </Fact>
          </View>
        ) : (
          <T style={s.muted}>No sheet recorded.</T>
        )}
      </View>
      {sheet?.photo ? (
        <View style={[s.chartBox, { alignItems: "center", marginTop: 6 }]} wrap={false}>
          {/* eslint-disable-next-line jsx-a11y/alt-text -- react-pdf's Image has no alt; the caption below names the photo */}
          <Image src={{ data: Buffer.from(sheet.photo.bytes), format: sheet.photo.contentType === "image/png" ? "png" : "jpg" }} style={{ maxWidth: "100%", maxHeight: 260, objectFit: "contain" }} />
          <T style={s.caption}>The photo of the indicator sheet as uploaded; its SHA-256 above identifies the stored file.</T>
        </View>
      ) : null}
      <T style={s.caption}>The logged cycle below, if a file was attached, is shown as information: its thermometric checks do not decide a Bowie-Dick test.</T>
    </View>
  );
}
