"use client";

import { useState } from "react";
import { INDICATOR_SHEET_RESULT_LABELS, INDICATOR_SHEET_RESULTS, type IndicatorSheetResult } from "@/lib/domain";

/** The reading of an indicator sheet: how it changed colour (named `outcome`) and the indicator's lot (`indicatorLot`). */
export function IndicatorSheetFields({
  idPrefix,
  errors,
  onChange,
}: {
  idPrefix: string;
  errors: Record<string, string>;
  onChange?: (value: { outcome: IndicatorSheetResult | ""; indicatorLot: string }) => void;
}) {
  const [outcome, setOutcome] = useState<IndicatorSheetResult | "">("");
  const [lot, setLot] = useState("");
  return (
    <div className="space-y-3">
      <fieldset>
        <legend className="field-label">How did the indicator sheet change?</legend>
        <div className="flex flex-col gap-2 sm:flex-row">
          {INDICATOR_SHEET_RESULTS.map((v) => (
            <label key={v} className={`flex flex-1 cursor-pointer items-center gap-2 rounded-md border px-3 py-2 text-sm ${outcome === v ? "border-steam-500 bg-steam-50" : "border-ink-line"}`}>
              <input
                type="radio"
                name="outcome"
                value={v}
                checked={outcome === v}
                onChange={() => {
                  setOutcome(v);
                  onChange?.({ outcome: v, indicatorLot: lot });
                }}
              />{" "}
              {INDICATOR_SHEET_RESULT_LABELS[v]}
            </label>
          ))}
        </div>
        {errors.outcome && <p className="field-error">{errors.outcome}</p>}
      </fieldset>
      <div>
        <label htmlFor={`${idPrefix}-lot`} className="field-label">
          Indicator lot
        </label>
        <input
          id={`${idPrefix}-lot`}
          name="indicatorLot"
          className="field-input"
          value={lot}
          maxLength={80}
          aria-invalid={!!errors.indicatorLot}
          onChange={(e) => {
            setLot(e.target.value);
            onChange?.({ outcome, indicatorLot: e.target.value });
          }}
        />
        {errors.indicatorLot && <p className="field-error">{errors.indicatorLot}</p>}
      </div>
    </div>
  );
}
