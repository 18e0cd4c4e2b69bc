// Independent cross-check for the OpsLvp TAF decoder: decodes every forecast of a corpus file with the npm package
// metar-taf-parser (parseTAF) and prints one JSON line per forecast, in corpus order:
//   {"line": <1-based line number>, "ok": true, "taf": <parseTAF output>}   or
//   {"line": <n>, "ok": false, "error": "<message>"}
// When the text has lower-case letters, "upper" holds the same result for the upper-cased text (the package does not
// fold case; the OpsLvp decoder does).
// Corpus format (see ../taf-corpus.txt): "#" comment and blank lines are skipped; a leading "!" marker is removed.
import { readFileSync } from "node:fs";
import { parseTAF } from "metar-taf-parser";

const path = process.argv[2];
if (!path) {
  console.error("usage: node decode-taf-corpus.mjs <taf-corpus.txt>");
  process.exit(2);
}
const lines = readFileSync(path, "utf8").split(/\r?\n/);
lines.forEach((raw, i) => {
  if (raw.trim() === "" || raw.startsWith("#")) {
    return;
  }
  const text = raw.startsWith("!") ? raw.slice(1) : raw;
  const result = { line: i + 1, ...decode(text) };
  if (text !== text.toUpperCase()) {
    result.upper = decode(text.toUpperCase());
  }
  console.log(JSON.stringify(result));
});

function decode(text) {
  try {
    return { ok: true, taf: parseTAF(text) };
  } catch (e) {
    return { ok: false, error: String(e && e.message) };
  }
}
