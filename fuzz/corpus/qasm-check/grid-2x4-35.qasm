OPENQASM 3.0;
include "stdgates.inc";
// written by qftplan 0.1.0
// device: grid:2x4
// transform: QFT on 4 qubits, exact
// strategy: chain (reversal network)
// placement: 1,2,3,7
// final_placement: 1,2,3,7
// placement[k] holds input bit k (weight 2^k) at the start; final_placement[k] holds output bit k at the end
h $7;
rz(pi/2**2) $7;
rz(pi/2**2) $3;
cx $7, $3;
rz(-pi/2**2) $3;
cx $3, $7;
cx $7, $3;
h $7;
rz(pi/2**3) $3;
rz(pi/2**3) $2;
cx $3, $2;
rz(-pi/2**3) $2;
cx $2, $3;
cx $3, $2;
rz(pi/2**4) $2;
rz(pi/2**4) $1;
cx $2, $1;
rz(-pi/2**4) $1;
cx $1, $2;
cx $2, $1;
rz(pi/2**2) $7;
rz(pi/2**2) $3;
cx $7, $3;
rz(-pi/2**2) $3;
cx $3, $7;
cx $7, $3;
h $7;
rz(pi/2**3) $3;
rz(pi/2**3) $2;
cx $3, $2;
rz(-pi/2**3) $2;
cx $2, $3;
cx $3, $2;
rz(pi/2**2) $7;
rz(pi/2**2) $3;
cx $7, $3;
rz(-pi/2**2) $3;
cx $3, $7;
cx $7, $3;
h $7;
