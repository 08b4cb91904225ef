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
