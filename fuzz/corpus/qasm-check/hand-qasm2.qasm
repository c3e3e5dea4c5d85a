OPENQASM 2.0;
include "qelib1.inc";
// device: full:5
// placement: 3,4
// final_placement: 4,3
qreg q[5];
creg c[2];
gate g(t) a,b { cu1(t) a,b; }
h q[4];
g(pi/2) q[4],q[3];
h q[3];
u1(-0.7853981633974483) q[0];
CX q[0],q[1];
measure q[3] -> c[0];
