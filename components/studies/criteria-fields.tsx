"use client";

import { TextInput } from "@/components/equipment/form-bits";
import { DEFAULT_REQUALIFICATION_MONTHS, DEFAULT_RUNS_REQUIRED } from "@/lib/domain";
import { formatNumber } from "@/lib/format";

export type CriteriaDefaults = {
  title?: string;
  runsRequired?: number;
  minF0Min?: number | null;
  maxSpreadK?: number | null;
  indicatorsRequired?: boolean;
  protocol?: string;
  requalificationMonths?: number;
};

/**
 * The acceptance criteria and texts of a study, for planning and for editing a draft. An empty minimum F0 or spread
 * takes the profile's figure, shown beside the field so the protocol says what applies.
 */
export function CriteriaFields({
  defaults = {},
  profileMinF0,
  profileMaxSpreadK,
  errors,
}: {
  defaults?: CriteriaDefaults;
  profileMinF0: number | null;
  profileMaxSpreadK: number | null;
  errors: Record<string, string>;
}) {
  return (
    <>
      <TextInput id="study-title" name="title" label="Title (optional)" defaultValue={defaults.title} error={errors.title} placeholder="Heat penetration, instrument trays" />
      <div className="grid gap-3 sm:grid-cols-2">
        <TextInput
          id="study-runs"
          name="runsRequired"
          label="Consecutive passing runs required"
          inputMode="numeric"
          defaultValue={defaults.runsRequired ?? DEFAULT_RUNS_REQUIRED}
          error={errors.runsRequired}
          hint="A failed run breaks the series: the last runs attached must all pass."
        />
        <TextInput
          id="study-requalification"
          name="requalificationMonths"
          label="Requalification interval"
          suffix="months"
          inputMode="numeric"
          defaultValue={defaults.requalificationMonths ?? DEFAULT_REQUALIFICATION_MONTHS}
          error={errors.requalificationMonths}
        />
        <TextInput
          id="study-min-f0"
          name="minF0Min"
          label="Minimum F0 at every load position"
          suffix="min"
          inputMode="decimal"
          defaultValue={defaults.minF0Min ?? ""}
          error={errors.minF0Min}
          hint={
            profileMinF0 === null
              ? "Empty: the profile's figure (choose a profile to see it)."
              : `Empty: ${formatNumber(profileMinF0, 1)} min, what the profile's hold delivers at its sterilization temperature.`
          }
        />
        <TextInput
          id="study-max-spread"
          name="maxSpreadK"
          label="Largest spread between positions during holding"
          suffix="K"
          inputMode="decimal"
          defaultValue={defaults.maxSpreadK ?? ""}
          error={errors.maxSpreadK}
          hint={profileMaxSpreadK === null ? "Empty: the profile's figure." : `Empty: the profile's ${formatNumber(profileMaxSpreadK, 1)} K.`}
        />
      </div>
      <label className="flex items-start gap-2 text-sm">
        <input type="checkbox" name="indicatorsRequired" defaultChecked={defaults.indicatorsRequired ?? true} className="mt-1" />
        <span>
          Biological indicators required at every position
          <span className="block text-xs text-ink-muted">A run stays pending until each position&apos;s biological indicator is read; any positive indicator fails the run.</span>
        </span>
      </label>
      <div>
        <label className="field-label" htmlFor="study-protocol">
          Protocol
        </label>
        <textarea
          id="study-protocol"
          name="protocol"
          className="field-input"
          rows={6}
          defaultValue={defaults.protocol ?? ""}
          aria-invalid={!!errors.protocol}
          aria-describedby={errors.protocol ? "study-protocol-error" : undefined}
          placeholder="Purpose, scope, the load and its preparation, probe placement, cycles to run, acceptance criteria, responsibilities."
        />
        {errors.protocol && (
          <p className="field-error" id="study-protocol-error">
            {errors.protocol}
          </p>
        )}
      </div>
    </>
  );
}
