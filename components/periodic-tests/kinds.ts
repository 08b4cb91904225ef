export const RECORDABLE_KINDS = ["air-leakage", "bowie-dick", "steam-non-condensable-gas", "steam-superheat", "steam-dryness"] as const;
export type RecordableKind = (typeof RECORDABLE_KINDS)[number];
export const isRecordable = (kind: string): kind is RecordableKind => (RECORDABLE_KINDS as readonly string[]).includes(kind);
