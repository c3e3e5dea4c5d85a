OPENQASM 2.0;
include "qelib1.inc";
// written by qftplan 0.1.0
// device: line:6
// transform: QFT on 4 qubits, exact
// strategy: chain (reversal network)
// placement: 2,3,4,5
// final_placement: 2,3,4,5
// placement[k] holds input bit k (weight 2^k) at the start; final_placement[k] holds output bit k at the end
qreg q[6];
h q[5];
cu1(pi/2) q[5], q[4];
cx q[5], q[4];
cx q[4], q[5];
cx q[5], q[4];
h q[5];
cu1(pi/4) q[4], q[3];
cx q[4], q[3];
cx q[3], q[4];
cx q[4], q[3];
cu1(pi/8) q[3], q[2];
cx q[3], q[2];
cx q[2], q[3];
cx q[3], q[2];
cu1(pi/2) q[5], q[4];
cx q[5], q[4];
cx q[4], q[5];
cx q[5], q[4];
h q[5];
cu1(pi/4) q[4], q[3];
cx q[4], q[3];
cx q[3], q[4];
cx q[4], q[3];
cu1(pi/2) q[5], q[4];
cx q[5], q[4];
cx q[4], q[5];
cx q[5], q[4];
h q[5];
