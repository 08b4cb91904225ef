"use client";

import type { InspectResponse } from "@/lib/cycles/contracts";
import { Panel } from "@/components/ui/panel";
import { MappingTable } from "./mapping-table";
import type { LoggerFiles } from "./use-logger-files";

const DELIMITER_WORDS: Record<string, string> = { ",": "comma", ";": "semicolon", "\t": "tab" };
const TIME_FORMAT_WORDS: Record<string, string> = {
  iso: "year-month-day dates",
  dmy: "day.month.year dates",
  mdy: "month/day/year dates",
  "mdy-ampm": "month/day/year dates with AM/PM",
  "dmy-ampm": "day/month/year dates with AM/PM",
  clock: "clock times",
  "elapsed-seconds": "elapsed time",
};

/** The file's dialect in words: "comma-separated · decimal "." · UTF-8 · year-month-day dates". */
function DialectLine({ dialect }: { dialect: InspectResponse["dialect"] }) {
  return (
    <span className="text-xs text-ink-muted">
      {DELIMITER_WORDS[dialect.delimiter] ?? dialect.delimiter}-separated · decimal &ldquo;{dialect.decimal}&rdquo; · {dialect.encoding}
      {dialect.preambleLines > 0 ? ` · ${dialect.preambleLines} lines above the header` : ""} · {TIME_FORMAT_WORDS[dialect.timeFormat] ?? dialect.timeFormat}
    </span>
  );
}

/** Step 2: the server's guess of what each column holds, for the user to confirm or correct. */
export function ColumnsPanel({ logger, inspect, idPrefix }: { logger: LoggerFiles; inspect: InspectResponse; idPrefix: string }) {
  const { mappingNotice, mappingErrors } = logger;
  return (
    <Panel title="2 · Check the columns" action={<DialectLine dialect={inspect.dialect} />}>
      <p className="mb-3 text-sm text-ink-soft">
        Papin guessed what each column holds. Correct anything that is wrong; marks <span className="text-caution-700">⚠</span> show what the guess was unsure of.
      </p>
      {mappingNotice && (
        <p className="mb-3 rounded-md border border-steam-100 bg-steam-50 px-3 py-2 text-sm text-steam-700" role="status" data-testid="mapping-notice">
          {mappingNotice}
        </p>
      )}
      {inspect.warnings.length > 0 && (
        <ul className="mb-3 space-y-1 text-sm text-caution-700">
          {inspect.warnings.map((w) => (
            <li key={w}>⚠ {w}</li>
          ))}
        </ul>
      )}
      <MappingTable
        idPrefix={idPrefix}
        columns={logger.columns}
        referenceColumn={logger.referenceColumn}
        freeSpaceColumn={logger.freeSpaceColumn}
        onRoleChange={logger.chooseRole}
        pressureReferenceError={logger.pressureReferenceError}
        preview={inspect.preview}
        rowCount={inspect.rowCount}
        guessedReference={inspect.referenceColumn}
        onColumnChange={logger.updateColumn}
        onReferenceChange={logger.chooseReference}
        placements={logger.placements}
        onPlacementChange={logger.placeChannel}
      />
      {(mappingErrors.length > 0 || logger.pressureReferenceError) && (
        <ul className="mt-3 space-y-1" data-testid="mapping-errors">
          {/* Repeated below the table: the pressure column may be scrolled out of view. */}
          {[...mappingErrors, ...(logger.pressureReferenceError ? [logger.pressureReferenceError] : [])].map((m) => (
            <li key={m} className="field-error text-sm">
              {m}
            </li>
          ))}
        </ul>
      )}
    </Panel>
  );
}
