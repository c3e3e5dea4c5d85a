OPENQASM 3.0;
include "stdgates.inc";
// device: line:4
// placement: 0,1,2
// final_placement: 2,1,0
qubit[4] q;
bit[3] c;
gate myqft a, b { h a; cp(pi/2) a, b; }
/* block
   comment */
h q[2];
cp(pi/2) q[2], q[1];
swap q[1], q[2];
h q[1];
cphase(pi / 2 ** 2) q[1], q[0];
cp(pi/2) q[2], q[1];
h q;
barrier q;
c[0] = measure q[0];
