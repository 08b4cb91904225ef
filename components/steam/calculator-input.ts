/**
 * A figure typed into the steam calculator, read before anything is asked of the server: a decimal comma is accepted,
 * and an empty or non-numeric entry gets a sentence naming the field, not the API's parameter wording.
 */
export type CalculatorNumber = { ok: true; text: string } | { ok: false; problem: string };

export function calculatorNumber(raw: string, label: string, example: string): CalculatorNumber {
  const text = raw.trim().replace(/\s/g, "").replace(",", ".");
  if (text === "") return { ok: false, problem: `Enter the ${label}, for example ${example}.` };
  if (!/^[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?$/i.test(text) || !Number.isFinite(Number(text))) {
    return { ok: false, problem: `The ${label} “${raw.trim()}” is not a number; enter it in figures, for example ${example}.` };
  }
  return { ok: true, text };
}
