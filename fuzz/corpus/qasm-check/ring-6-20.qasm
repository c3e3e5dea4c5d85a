OPENQASM 2.0;
include "qelib1.inc";
// written by qftplan 0.1.0
// device: ring:6
// transform: QFT on 4 qubits, exact
// strategy: chain (reversal network)
// placement: 0,1,2,3
// final_placement: 0,1,2,3
// placement[k] holds input bit k (weight 2^k) at the start; final_placement[k] holds output bit k at the end
qreg q[6];
h q[3];
cu1(pi/2) q[3], q[2];
cx q[3], q[2];
cx q[2], q[3];
cx q[3], q[2];
h q[3];
cu1(pi/4) q[2], q[1];
cx q[2], q[1];
cx q[1], q[2];
cx q[2], q[1];
cu1(pi/8) q[1], q[0];
cx q[1], q[0];
cx q[0], q[1];
cx q[1], q[0];
cu1(pi/2) q[3], q[2];
cx q[3], q[2];
cx q[2], q[3];
cx q[3], q[2];
h q[3];
cu1(pi/4) q[2], q[1];
cx q[2], q[1];
cx q[1], q[2];
cx q[2], q[1];
cu1(pi/2) q[3], q[2];
cx q[3], q[2];
cx q[2], q[3];
cx q[3], q[2];
h q[3];
