/** Raised when a state has no liquid–vapour line (below the triple point, above the critical point) or an input is not a finite number. */
export class SteamRangeError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "SteamRangeError";
  }
}
