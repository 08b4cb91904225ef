import { BOWIE_DICK } from "./limits";

export type BowieDickOutcome = "uniform" | "non-uniform";

export function evaluateBowieDick(outcome: BowieDickOutcome): { passed: boolean; basis: string; meaning: string } {
  if (outcome === "uniform") {
    return { passed: true, basis: BOWIE_DICK.basis, meaning: "Uniform colour change: steam penetrated the test pack evenly." };
  }
  return {
    passed: false,
    basis: BOWIE_DICK.basis,
    meaning:
      "A paler or uneven area means steam did not penetrate evenly: poor air removal, a leak during air removal or non-condensable gas in the steam are possible causes. Take the sterilizer out of use until the cause is found and a repeat test passes.",
  };
}
