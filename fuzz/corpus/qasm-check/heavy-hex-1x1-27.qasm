OPENQASM 2.0;
include "qelib1.inc";
// written by qftplan 0.1.0
// device: heavy-hex:1x1
// transform: QFT on 4 qubits, exact
// strategy: chain (reversal network)
// placement: 3,4,6,11
// final_placement: 3,4,6,11
// placement[k] holds input bit k (weight 2^k) at the start; final_placement[k] holds output bit k at the end
qreg q[12];
h q[11];
cu1(pi/2) q[11], q[6];
cx q[11], q[6];
cx q[6], q[11];
cx q[11], q[6];
h q[11];
cu1(pi/4) q[6], q[4];
cx q[6], q[4];
cx q[4], q[6];
cx q[6], q[4];
cu1(pi/8) q[4], q[3];
cx q[4], q[3];
cx q[3], q[4];
cx q[4], q[3];
cu1(pi/2) q[11], q[6];
cx q[11], q[6];
cx q[6], q[11];
cx q[11], q[6];
h q[11];
cu1(pi/4) q[6], q[4];
cx q[6], q[4];
cx q[4], q[6];
cx q[6], q[4];
cu1(pi/2) q[11], q[6];
cx q[11], q[6];
cx q[6], q[11];
cx q[11], q[6];
h q[11];
