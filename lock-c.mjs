import { createClient } from "@libsql/client";
const url = "file:/tmp/h1exp/t.db";
const a = createClient({ url });
await a.execute("select count(*) from t");
a.close(); globalThis.gc?.();
console.log("closed", a.closed);
await new Promise(r=>setTimeout(r,200));
const b = createClient({ url, timeout: 0 });
for (const sql of ["PRAGMA locking_mode=EXCLUSIVE", "BEGIN EXCLUSIVE", "select count(*) from t"]) {
  try { const r = await b.execute(sql); console.log(sql, "ok", r.rows[0]); } catch (e) { console.log(sql, "FAIL", e.message); }
}
