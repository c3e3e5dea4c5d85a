OPENQASM 3.0;
include "stdgates.inc";
// written by qftplan 0.1.0
// device: grid:3x3
// transform: QFT on 3 qubits, exact
// strategy: chain (reversal network)
// placement: 2,5,8
// final_placement: 2,5,8
// placement[k] holds input bit k (weight 2^k) at the start; final_placement[k] holds output bit k at the end
h $8;
cp(pi/2) $8, $5;
swap $8, $5;
h $8;
cp(pi/2**2) $5, $2;
swap $5, $2;
cp(pi/2) $8, $5;
swap $8, $5;
h $8;
