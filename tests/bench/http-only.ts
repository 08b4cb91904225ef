// The HTTP cases of the bench alone (`npx tsx tests/bench/http-only.ts`), for a second look without the minutes of the
// file cases; the yardstick (a bare node parse of the day file) is taken in the same run, as `npm run bench` does.
import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { simulateDay, toLoggerCsv } from "../../lib/simulator";
import { serverBench } from "./http";

const BASELINE_SCRIPT = `const t=require("node:fs").readFileSync(process.argv[2],"utf8").split("\\n");let s=0;for(let i=1;i<t.length;i++){const f=t[i].split(",");for(let k=1;k<f.length;k++)s+=parseFloat(f[k])||0}process.stdout.write(String(s))`;

async function main(): Promise<number> {
  const dir = mkdtempSync(path.join(tmpdir(), "papin-bench-http-"));
  try {
    const bytes = toLoggerCsv(simulateDay({ temperatureChannels: 16, samples: 86_400, sterilizationTempC: 134, holdingTimeS: 180 }));
    const file = path.join(dir, "day.csv");
    writeFileSync(file, bytes);
    const times = [0, 1, 2, 3].map(() => {
      const started = performance.now();
      spawnSync(process.execPath, ["-e", BASELINE_SCRIPT, file]);
      return (performance.now() - started) / 1000;
    });
    const baselineS = times.slice(1).sort((a, b) => a - b)[1];
    const result = await serverBench({ dir, dayBytes: bytes, dayTempC: 134, baselineS });
    console.log(`yardstick: bare node parse of the day file ${baselineS.toFixed(3)} s`);
    for (const row of result.rows) console.log(`| ${row.join(" | ")} |`);
    return result.failed ? 1 : 0;
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

main().then((code) => process.exit(code));
