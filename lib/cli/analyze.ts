import { reportResourcesOnExit, runAnalyze } from "./run-analyze";

reportResourcesOnExit();
const code = runAnalyze(process.argv.slice(2), {
  out: (text) => process.stdout.write(text),
  err: (line) => process.stderr.write(line + "\n"),
});
process.exitCode = code;
