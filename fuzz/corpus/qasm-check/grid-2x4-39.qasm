OPENQASM 3.0;
include "stdgates.inc";
// written by qftplan 0.1.0
// device: grid:2x4
// transform: QFT on 3 qubits, exact
// strategy: chain (reversal network)
// placement: 2,3,7
// final_placement: 2,3,7
// placement[k] holds input bit k (weight 2^k) at the start; final_placement[k] holds output bit k at the end
h $7;
cp(pi/2) $7, $3;
swap $7, $3;
h $7;
cp(pi/2**2) $3, $2;
swap $3, $2;
cp(pi/2) $7, $3;
swap $7, $3;
h $7;
