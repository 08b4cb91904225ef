import { createClient } from "@libsql/client";
const url = "file:/tmp/h1exp/t.db";
const b = createClient({ url, timeout: Number(process.argv[2] ?? 0) });
for (const sql of process.argv.slice(3)) {
  try { const r = await b.execute(sql); console.log(sql, "ok", r.rows[0]); } catch (e) { console.log(sql, "FAIL", e.message); }
}
b.close();
