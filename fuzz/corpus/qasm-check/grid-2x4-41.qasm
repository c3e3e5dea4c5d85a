OPENQASM 2.0;
include "qelib1.inc";
// written by qftplan 0.1.0
// device: grid:2x4
// transform: QFT on 4 qubits, exact
// strategy: chain (reversal network)
// placement: 1,2,3,7
// final_placement: 1,2,3,7
// placement[k] holds input bit k (weight 2^k) at the start; final_placement[k] holds output bit k at the end
qreg q[8];
h q[7];
cu1(pi/2) q[7], q[3];
cx q[7], q[3];
cx q[3], q[7];
cx q[7], q[3];
h q[7];
cu1(pi/4) q[3], q[2];
cx q[3], q[2];
cx q[2], q[3];
cx q[3], q[2];
cu1(pi/8) q[2], q[1];
cx q[2], q[1];
cx q[1], q[2];
cx q[2], q[1];
cu1(pi/2) q[7], q[3];
cx q[7], q[3];
cx q[3], q[7];
cx q[7], q[3];
h q[7];
cu1(pi/4) q[3], q[2];
cx q[3], q[2];
cx q[2], q[3];
cx q[3], q[2];
cu1(pi/2) q[7], q[3];
cx q[7], q[3];
cx q[3], q[7];
cx q[7], q[3];
h q[7];
