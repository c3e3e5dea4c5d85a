OPENQASM 3.0;
include "stdgates.inc";
// written by qftplan 0.1.0
// device: ring:6
// transform: QFT on 3 qubits, exact
// strategy: chain (reversal network)
// placement: 1,2,3
// final_placement: 1,2,3
// placement[k] holds input bit k (weight 2^k) at the start; final_placement[k] holds output bit k at the end
h $3;
cp(pi/2) $3, $2;
swap $3, $2;
h $3;
cp(pi/2**2) $2, $1;
swap $2, $1;
cp(pi/2) $3, $2;
swap $3, $2;
h $3;
