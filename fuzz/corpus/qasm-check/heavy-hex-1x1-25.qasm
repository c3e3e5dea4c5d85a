OPENQASM 3.0;
include "stdgates.inc";
// written by qftplan 0.1.0
// device: heavy-hex:1x1
// transform: QFT on 3 qubits, exact
// strategy: chain (reversal network)
// placement: 4,6,11
// final_placement: 4,6,11
// placement[k] holds input bit k (weight 2^k) at the start; final_placement[k] holds output bit k at the end
h $11;
cp(pi/2) $11, $6;
swap $11, $6;
h $11;
cp(pi/2**2) $6, $4;
swap $6, $4;
cp(pi/2) $11, $6;
swap $11, $6;
h $11;
