OPENQASM 2.0;
include "qelib1.inc";
// written by qftplan 0.1.0
// device: full:5
// transform: QFT on 4 qubits, exact
// strategy: routed
// placement: 0,4,3,1
// final_placement: 1,3,4,0
// placement[k] holds input bit k (weight 2^k) at the start; final_placement[k] holds output bit k at the end
qreg q[5];
h q[1];
cu1(pi/2) q[1], q[3];
cu1(pi/4) q[1], q[4];
cu1(pi/8) q[1], q[0];
h q[3];
cu1(pi/2) q[3], q[4];
cu1(pi/4) q[3], q[0];
h q[4];
cu1(pi/2) q[4], q[0];
h q[0];
