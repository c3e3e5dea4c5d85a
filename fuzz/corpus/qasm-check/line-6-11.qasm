OPENQASM 3.0;
include "stdgates.inc";
// written by qftplan 0.1.0
// device: line:6
// transform: QFT on 3 qubits, exact
// strategy: chain (reversal network)
// placement: 3,4,5
// final_placement: 3,4,5
// placement[k] holds input bit k (weight 2^k) at the start; final_placement[k] holds output bit k at the end
h $5;
cp(pi/2) $5, $4;
swap $5, $4;
h $5;
cp(pi/2**2) $4, $3;
swap $4, $3;
cp(pi/2) $5, $4;
swap $5, $4;
h $5;
