OPENQASM 2.0;
include "qelib1.inc";
// written by qftplan 0.1.0
// device: dyn9
// transform: QFT on 5 qubits, approximate (degree 2)
// strategy: semiclassical
// placement: 0,1,2,3,4
// final_placement: 4,3,2,1,0
// placement[k] holds input bit k (weight 2^k) at the start; final_placement[k] holds output bit k at the end
// readout: semiclassical; final_placement[k] is measured into register ck (output bit k, weight 2^k) as soon as its corrections are done
qreg q[9];
creg c0[1];
creg c1[1];
creg c2[1];
creg c3[1];
creg c4[1];
h q[4];
measure q[4] -> c0[0];
if(c0==1) u1(pi/2) q[3];
h q[3];
measure q[3] -> c1[0];
if(c1==1) u1(pi/2) q[2];
h q[2];
measure q[2] -> c2[0];
if(c2==1) u1(pi/2) q[1];
h q[1];
measure q[1] -> c3[0];
if(c3==1) u1(pi/2) q[0];
h q[0];
measure q[0] -> c4[0];
