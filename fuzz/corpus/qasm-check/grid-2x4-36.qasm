OPENQASM 3.0;
include "stdgates.inc";
// written by qftplan 0.1.0
// device: grid:2x4
// transform: inverse QFT on 5 qubits, exact
// strategy: chain (reversal network)
// placement: 0,1,2,3,7
// final_placement: 0,1,2,3,7
// placement[k] holds input bit k (weight 2^k) at the start; final_placement[k] holds output bit k at the end
h $7;
rz(-pi/2**2) $3;
rz(-pi/2**2) $7;
cx $3, $7;
rz(pi/2**2) $7;
cx $7, $3;
cx $3, $7;
rz(-pi/2**3) $2;
rz(-pi/2**3) $3;
cx $2, $3;
rz(pi/2**3) $3;
cx $3, $2;
cx $2, $3;
h $7;
rz(-pi/2**2) $3;
rz(-pi/2**2) $7;
cx $3, $7;
rz(pi/2**2) $7;
cx $7, $3;
cx $3, $7;
rz(-pi/2**4) $1;
rz(-pi/2**4) $2;
cx $1, $2;
rz(pi/2**4) $2;
cx $2, $1;
cx $1, $2;
rz(-pi/2**3) $2;
rz(-pi/2**3) $3;
cx $2, $3;
rz(pi/2**3) $3;
cx $3, $2;
cx $2, $3;
rz(-pi/2**5) $0;
rz(-pi/2**5) $1;
cx $0, $1;
rz(pi/2**5) $1;
cx $1, $0;
cx $0, $1;
h $7;
rz(-pi/2**2) $3;
rz(-pi/2**2) $7;
cx $3, $7;
rz(pi/2**2) $7;
cx $7, $3;
cx $3, $7;
rz(-pi/2**4) $1;
rz(-pi/2**4) $2;
cx $1, $2;
rz(pi/2**4) $2;
cx $2, $1;
cx $1, $2;
rz(-pi/2**3) $2;
rz(-pi/2**3) $3;
cx $2, $3;
rz(pi/2**3) $3;
cx $3, $2;
cx $2, $3;
h $7;
rz(-pi/2**2) $3;
rz(-pi/2**2) $7;
cx $3, $7;
rz(pi/2**2) $7;
cx $7, $3;
cx $3, $7;
h $7;
