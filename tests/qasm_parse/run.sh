#!/usr/bin/env bash
# Emits OpenQASM 3 circuits with qftplan and parses them with qasm-ts (see parse_files.mjs).
# Usage: run.sh QFTPLAN_BINARY
set -euo pipefail
bin=$1
here=$(cd "$(dirname "$0")" && pwd)
if [ ! -d "$here/node_modules/qasm-ts" ]; then
  echo "qasm-ts is not installed in $here/node_modules (./tools/test installs it)" >&2
  exit 1
fi
work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
i=0
for dev in line:6 grid:3x3 heavy-hex:1x1 "$here/../../topologies/harbor-noisy-20.yaml"; do
  for gates in logical cx cz; do
    for extra in "" "--inverse" "--approx 3"; do
      i=$((i + 1))
      # shellcheck disable=SC2086
      "$bin" plan --device "$dev" --qubits 5 --gates "$gates" $extra --output "$work/c$i.qasm"
    done
  done
done
# The semi-classical readout (issue 20): mid-circuit measurements and phases conditioned on bits.
# qasm-ts 2.1.4 cannot read a hardware qubit as the operand of a measurement (its measureStatement
# reads operands as expressions, which have no `$`), although the OpenQASM 3 grammar allows it
# (measureExpression: MEASURE gateOperand; gateOperand: indexedIdentifier | HardwareQubit). So these
# files are parsed with their hardware qubits $k renamed to a declared register q[k]: that checks every
# other construct they use (bit[n] c; c[k] = measure ...; if (c[j]) p(...) ...;).
for extra in "" "--inverse" "--inverse --approx 2"; do
  i=$((i + 1))
  # shellcheck disable=SC2086
  "$bin" plan --device "$here/../../topologies/harbor-line-12.yaml" --qubits 5 --measure --readout semiclassical \
    $extra --output "$work/sc$i.raw"
  grep -q "^if (c\\[[0-9]*\\]) p(" "$work/sc$i.raw"  # conditioned phases are there
  sed -E -e 's/\$([0-9]+)/q[\1]/g' -e 's/^(include "stdgates.inc";)$/\1\nqubit[12] q;/' "$work/sc$i.raw" > "$work/sc$i.qasm"
done
# A deliberately broken file: the parser must reject it.
printf 'OPENQASM 3.0;\ninclude "stdgates.inc";\nh $0\ncp(pi/2) $0 $1;\n' > "$work/broken.bad.qasm"
cd "$here"
node --import ./register_shim.mjs parse_files.mjs "$work"/*.qasm
