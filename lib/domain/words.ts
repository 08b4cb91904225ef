/**
 * The one way Papin prints a count with its noun: "1 channel", "12 channels", "0 channels",
 * "1,204 readings". Irregular plurals are given: plural(2, "analysis", "analyses").
 */
export function plural(count: number, singular: string, pluralForm = `${singular}s`): string {
  const number = Number.isInteger(count) ? count.toLocaleString("en-GB") : String(count);
  return `${number} ${count === 1 ? singular : pluralForm}`;
}

/** The word alone, for a sentence that prints its count elsewhere: "is"/"are", "its"/"their". */
export function agree(count: number, singular: string, pluralForm = `${singular}s`): string {
  return count === 1 ? singular : pluralForm;
}

/**
 * A column's header with its unit, without saying the unit twice: "Chamber (bar abs)" with "bar abs" stays as it is,
 * "Chamber (bar)" with "bar abs" becomes "Chamber (bar), abs", "P1" with "kPa gauge" becomes "P1 (kPa gauge)".
 */
export function headerWithUnit(header: string, unitText: string): string {
  const said = new Set(
    (header.match(/[([]([^)\]]*)[)\]]/g) ?? []).flatMap((b) =>
      b
        .slice(1, -1)
        .toLowerCase()
        .split(/[\s,]+/),
    ),
  );
  const words = unitText.split(/\s+/).filter(Boolean);
  const missing = words.filter((w) => !said.has(w.toLowerCase()));
  if (missing.length === 0) return header;
  return missing.length === words.length ? `${header} (${unitText})` : `${header}, ${missing.join(" ")}`;
}
