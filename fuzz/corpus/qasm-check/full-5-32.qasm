OPENQASM 3.0;
include "stdgates.inc";
// written by qftplan 0.1.0
// device: full:5
// transform: QFT on 3 qubits, exact
// strategy: routed
// placement: 4,3,1
// final_placement: 1,3,4
// placement[k] holds input bit k (weight 2^k) at the start; final_placement[k] holds output bit k at the end
h $1;
cp(pi/2) $1, $3;
cp(pi/2**2) $1, $4;
h $3;
cp(pi/2) $3, $4;
h $4;
