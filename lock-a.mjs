import { createClient } from "@libsql/client";
const a = createClient({ url: "file:/tmp/h1exp/t.db" });
await a.execute("PRAGMA journal_mode=WAL");
await a.execute("create table if not exists t(x)");
await a.execute("insert into t values (1)");
console.log("A open"); setTimeout(()=>{}, 4000);
