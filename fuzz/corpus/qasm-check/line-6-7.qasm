OPENQASM 3.0;
include "stdgates.inc";
// written by qftplan 0.1.0
// device: line:6
// transform: QFT on 4 qubits, exact
// strategy: chain (reversal network)
// placement: 2,3,4,5
// final_placement: 2,3,4,5
// placement[k] holds input bit k (weight 2^k) at the start; final_placement[k] holds output bit k at the end
h $5;
rz(pi/2**2) $5;
rz(pi/2**2) $4;
cx $5, $4;
rz(-pi/2**2) $4;
cx $4, $5;
cx $5, $4;
h $5;
rz(pi/2**3) $4;
rz(pi/2**3) $3;
cx $4, $3;
rz(-pi/2**3) $3;
cx $3, $4;
cx $4, $3;
rz(pi/2**4) $3;
rz(pi/2**4) $2;
cx $3, $2;
rz(-pi/2**4) $2;
cx $2, $3;
cx $3, $2;
rz(pi/2**2) $5;
rz(pi/2**2) $4;
cx $5, $4;
rz(-pi/2**2) $4;
cx $4, $5;
cx $5, $4;
h $5;
rz(pi/2**3) $4;
rz(pi/2**3) $3;
cx $4, $3;
rz(-pi/2**3) $3;
cx $3, $4;
cx $4, $3;
rz(pi/2**2) $5;
rz(pi/2**2) $4;
cx $5, $4;
rz(-pi/2**2) $4;
cx $4, $5;
cx $5, $4;
h $5;
