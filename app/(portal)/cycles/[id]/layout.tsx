import { guardCycleRecord } from "./record";

type Props = { children: React.ReactNode; params: Promise<{ id: string }> };

// Above loading.tsx: nothing streams until the guard and the existence check have answered.
export default async function CycleRecordLayout({ children, params }: Props) {
  await guardCycleRecord((await params).id);
  return children;
}
