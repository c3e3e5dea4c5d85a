OPENQASM 3.0;
include "stdgates.inc";
// written by qftplan 0.1.0
// device: grid:3x3
// transform: inverse QFT on 5 qubits, exact
// strategy: chain (reversal network)
// placement: 0,1,2,5,8
// final_placement: 0,1,2,5,8
// placement[k] holds input bit k (weight 2^k) at the start; final_placement[k] holds output bit k at the end
h $8;
rz(-pi/2**2) $5;
rz(-pi/2**2) $8;
cx $5, $8;
rz(pi/2**2) $8;
cx $8, $5;
cx $5, $8;
rz(-pi/2**3) $2;
rz(-pi/2**3) $5;
cx $2, $5;
rz(pi/2**3) $5;
cx $5, $2;
cx $2, $5;
h $8;
rz(-pi/2**2) $5;
rz(-pi/2**2) $8;
cx $5, $8;
rz(pi/2**2) $8;
cx $8, $5;
cx $5, $8;
rz(-pi/2**4) $1;
rz(-pi/2**4) $2;
cx $1, $2;
rz(pi/2**4) $2;
cx $2, $1;
cx $1, $2;
rz(-pi/2**3) $2;
rz(-pi/2**3) $5;
cx $2, $5;
rz(pi/2**3) $5;
cx $5, $2;
cx $2, $5;
rz(-pi/2**5) $0;
rz(-pi/2**5) $1;
cx $0, $1;
rz(pi/2**5) $1;
cx $1, $0;
cx $0, $1;
h $8;
rz(-pi/2**2) $5;
rz(-pi/2**2) $8;
cx $5, $8;
rz(pi/2**2) $8;
cx $8, $5;
cx $5, $8;
rz(-pi/2**4) $1;
rz(-pi/2**4) $2;
cx $1, $2;
rz(pi/2**4) $2;
cx $2, $1;
cx $1, $2;
rz(-pi/2**3) $2;
rz(-pi/2**3) $5;
cx $2, $5;
rz(pi/2**3) $5;
cx $5, $2;
cx $2, $5;
h $8;
rz(-pi/2**2) $5;
rz(-pi/2**2) $8;
cx $5, $8;
rz(pi/2**2) $8;
cx $8, $5;
cx $5, $8;
h $8;
