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
rz(pi/4) q[1];
rz(pi/4) q[3];
h q[3];
cz q[1], q[3];
h q[3];
rz(-pi/4) q[3];
h q[3];
cz q[1], q[3];
h q[3];
rz(pi/8) q[1];
rz(pi/8) q[4];
h q[4];
cz q[1], q[4];
h q[4];
rz(-pi/8) q[4];
h q[4];
cz q[1], q[4];
h q[4];
rz(pi/16) q[1];
rz(pi/16) q[0];
h q[0];
cz q[1], q[0];
h q[0];
rz(-pi/16) q[0];
h q[0];
cz q[1], q[0];
h q[0];
h q[3];
rz(pi/4) q[3];
rz(pi/4) q[4];
h q[4];
cz q[3], q[4];
h q[4];
rz(-pi/4) q[4];
h q[4];
cz q[3], q[4];
h q[4];
rz(pi/8) q[3];
rz(pi/8) q[0];
h q[0];
cz q[3], q[0];
h q[0];
rz(-pi/8) q[0];
h q[0];
cz q[3], q[0];
h q[0];
h q[4];
rz(pi/4) q[4];
rz(pi/4) q[0];
h q[0];
cz q[4], q[0];
h q[0];
rz(-pi/4) q[0];
h q[0];
cz q[4], q[0];
h q[0];
h q[0];
