/** An error in how the command was called: exit code 2. */
export class UsageError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "UsageError";
  }
}

/** A number option, its decimal comma accepted; required when no fallback is given. */
export function numberFlag(values: Map<string, string>, name: string, fallback?: number): number {
  const raw = values.get(name);
  if (raw === undefined) {
    if (fallback === undefined) throw new UsageError(`--${name} is required (see --help)`);
    return fallback;
  }
  const value = Number(raw.replace(",", "."));
  if (raw.trim() === "" || !Number.isFinite(value)) throw new UsageError(`--${name} needs a number, not "${raw}"`);
  return value;
}
