OPENQASM 3.0;
include "stdgates.inc";
// written by qftplan 0.1.0
// device: heavy-hex:1x1
// transform: inverse QFT on 5 qubits, exact
// strategy: chain (reversal network)
// placement: 2,3,4,6,11
// final_placement: 2,3,4,6,11
// placement[k] holds input bit k (weight 2^k) at the start; final_placement[k] holds output bit k at the end
h $11;
rz(-pi/2**2) $6;
rz(-pi/2**2) $11;
cx $6, $11;
rz(pi/2**2) $11;
cx $11, $6;
cx $6, $11;
rz(-pi/2**3) $4;
rz(-pi/2**3) $6;
cx $4, $6;
rz(pi/2**3) $6;
cx $6, $4;
cx $4, $6;
h $11;
rz(-pi/2**2) $6;
rz(-pi/2**2) $11;
cx $6, $11;
rz(pi/2**2) $11;
cx $11, $6;
cx $6, $11;
rz(-pi/2**4) $3;
rz(-pi/2**4) $4;
cx $3, $4;
rz(pi/2**4) $4;
cx $4, $3;
cx $3, $4;
rz(-pi/2**3) $4;
rz(-pi/2**3) $6;
cx $4, $6;
rz(pi/2**3) $6;
cx $6, $4;
cx $4, $6;
rz(-pi/2**5) $2;
rz(-pi/2**5) $3;
cx $2, $3;
rz(pi/2**5) $3;
cx $3, $2;
cx $2, $3;
h $11;
rz(-pi/2**2) $6;
rz(-pi/2**2) $11;
cx $6, $11;
rz(pi/2**2) $11;
cx $11, $6;
cx $6, $11;
rz(-pi/2**4) $3;
rz(-pi/2**4) $4;
cx $3, $4;
rz(pi/2**4) $4;
cx $4, $3;
cx $3, $4;
rz(-pi/2**3) $4;
rz(-pi/2**3) $6;
cx $4, $6;
rz(pi/2**3) $6;
cx $6, $4;
cx $4, $6;
h $11;
rz(-pi/2**2) $6;
rz(-pi/2**2) $11;
cx $6, $11;
rz(pi/2**2) $11;
cx $11, $6;
cx $6, $11;
h $11;
