#!/usr/bin/env bash
# Submits the demo screen (examples/demo) to a running Pointfold server through the public API
# with the command line, waits, unpacks the cleaned files, manifest.json and summary.csv, and
# prints what came back. CI runs it against a test server (tests/server/batches/examples.test.ts).
#
#   npm start                                   # in another terminal
#   export POINTFOLD_TOKEN=$(npm run --silent pointfold -- token create --email chemist@example.org)
#   examples/submit-demo.sh [OUT_DIR]           # default OUT_DIR: examples/out
#
# POINTFOLD_SERVER defaults to http://127.0.0.1:4380 (npm start's address).
set -euo pipefail
cd "$(dirname "$0")/.."

server="${POINTFOLD_SERVER:-http://127.0.0.1:4380}"
: "${POINTFOLD_TOKEN:?set POINTFOLD_TOKEN, e.g. with: npm run --silent pointfold -- token create --email chemist@example.org}"
out="${1:-examples/out}"

status=0
npm run --silent pointfold -- submit \
  examples/demo/ligands.xyz examples/demo/fragments.xyz examples/demo/complexes.sdf examples/demo/clusters.qcschema.json \
  --server "$server" --tolerance 0.1 --wait --out "$out" || status=$?

# Status 1 means "some structures could not be read or snapped" — expected here: ligands.xyz holds
# one unreadable frame on purpose. Anything else is a real failure.
if [ "$status" -ne 0 ] && [ "$status" -ne 1 ]; then
  echo "submit failed with status $status" >&2
  exit "$status"
fi

node - "$out/manifest.json" <<'JS'
const fs = require('node:fs');
const { structures } = JSON.parse(fs.readFileSync(process.argv[2], 'utf8'));
const done = structures.filter((s) => s.status === 'done');
const failed = structures.filter((s) => s.status !== 'done');
for (const s of done) {
  console.log(`${s.name.padEnd(36)} ${s.perceivedGroup.padEnd(4)} → ${s.pointGroup.padEnd(4)} (${s.computationalSubgroup.padEnd(3)})  moved ≤ ${s.maxDisplacement.toFixed(4)} Å  ${s.flags.join(' ')}`);
}
for (const s of failed) console.log(`${s.name.padEnd(36)} ${s.status}: ${s.error}`);
console.log(`${done.length} snapped, ${failed.length} not; files in ${require('node:path').dirname(process.argv[2])}`);
// The demo's expected shape (examples/README.md): 36 snapped, the one unreadable frame, the two flagged cases.
const flagged = (f) => done.filter((s) => s.flags.includes(f)).map((s) => s.name.slice(0, 3)).sort().join(',');
if (done.length !== 36 || failed.length !== 1 || flagged('over-budget') !== 'C06' || flagged('knife-edge') !== 'C06,F15') {
  console.error('unexpected result for the demo screen');
  process.exit(1);
}
JS
