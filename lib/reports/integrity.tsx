import { View } from "@react-pdf/renderer";
import type { LedgerHead } from "@/lib/integrity/anchors";
import { s } from "./styles";
import { T } from "./parts";
import { plural } from "@/lib/domain";

/**
 * The audit ledger's head when the report was sealed at sign-off: anyone holding the PDF can later
 * ask whether the ledger still has this many events and this hash at this event.
 */
export function LedgerHeadRow({ head }: { head: LedgerHead }) {
  return (
    <View style={s.identityRow} wrap={false}>
      <T style={s.identityLabel}>Audit ledger at sign-off</T>
      <View style={{ flex: 1 }}>
        <T>{`${plural(head.events, "event")}; the last is event ${head.lastSeq}, chain hash (SHA-256):`}</T>
        <T style={s.monoSmall}>{head.lastHash}</T>
      </View>
    </View>
  );
}
