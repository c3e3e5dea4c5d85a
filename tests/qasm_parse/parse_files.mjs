// Usage: node --import ./register_shim.mjs parse_files.mjs FILE...
// Parses each OpenQASM 3 file with qasm-ts (an independent implementation of the OpenQASM 3
// grammar) and exits non-zero if any fails. A file named *.bad.qasm must FAIL to parse (this keeps
// the check itself honest).
import { readFileSync } from 'node:fs';
import { parseString } from 'qasm-ts';

let failures = 0;
for (const file of process.argv.slice(2)) {
  const text = readFileSync(file, 'utf8');
  const mustFail = file.endsWith('.bad.qasm');
  let ok = true;
  let why = '';
  try {
    parseString(text, 3);
  } catch (e) {
    ok = false;
    why = e.message;
  }
  if (ok === mustFail) {
    failures++;
    console.log(`FAIL ${file}: ${mustFail ? 'parsed, but should not' : why}`);
  } else {
    console.log(`ok   ${file}`);
  }
}
console.log(`${process.argv.length - 2 - failures} passed, ${failures} failed`);
process.exit(failures ? 1 : 0);
