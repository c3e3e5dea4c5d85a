OPENQASM 2.0;
include "qelib1.inc";
// written by qftplan 0.1.0
// device: grid:3x3
// transform: QFT on 4 qubits, exact
// strategy: chain (reversal network)
// placement: 1,2,5,8
// final_placement: 1,2,5,8
// placement[k] holds input bit k (weight 2^k) at the start; final_placement[k] holds output bit k at the end
qreg q[9];
h q[8];
cu1(pi/2) q[8], q[5];
cx q[8], q[5];
cx q[5], q[8];
cx q[8], q[5];
h q[8];
cu1(pi/4) q[5], q[2];
cx q[5], q[2];
cx q[2], q[5];
cx q[5], q[2];
cu1(pi/8) q[2], q[1];
cx q[2], q[1];
cx q[1], q[2];
cx q[2], q[1];
cu1(pi/2) q[8], q[5];
cx q[8], q[5];
cx q[5], q[8];
cx q[8], q[5];
h q[8];
cu1(pi/4) q[5], q[2];
cx q[5], q[2];
cx q[2], q[5];
cx q[5], q[2];
cu1(pi/2) q[8], q[5];
cx q[8], q[5];
cx q[5], q[8];
cx q[8], q[5];
h q[8];
