OPENQASM 3.0;
include "stdgates.inc";
// written by qftplan 0.1.0
// device: grid:3x3
// transform: inverse QFT on 6 qubits, approximate (degree 3)
// strategy: routed
// placement: 8,2,4,1,3,0
// final_placement: 3,0,1,2,5,8
// placement[k] holds input bit k (weight 2^k) at the start; final_placement[k] holds output bit k at the end
bit[6] c;
h $0;
rz(-pi/2**2) $3;
rz(-pi/2**2) $0;
cx $3, $0;
rz(pi/2**2) $0;
cx $3, $0;
h $3;
rz(-pi/2**3) $1;
rz(-pi/2**3) $0;
cx $1, $0;
rz(pi/2**3) $0;
cx $1, $0;
rz(-pi/2**3) $4;
rz(-pi/2**3) $3;
cx $4, $3;
rz(pi/2**3) $3;
cx $4, $3;
cx $0, $3;
cx $3, $0;
cx $0, $3;
rz(-pi/2**2) $1;
rz(-pi/2**2) $0;
cx $1, $0;
rz(pi/2**2) $0;
cx $1, $0;
h $1;
rz(-pi/2**2) $4;
rz(-pi/2**2) $1;
cx $4, $1;
rz(pi/2**2) $1;
cx $4, $1;
cx $4, $5;
cx $5, $4;
cx $4, $5;
h $5;
rz(-pi/2**3) $2;
rz(-pi/2**3) $1;
cx $2, $1;
rz(pi/2**3) $1;
cx $2, $1;
rz(-pi/2**3) $8;
rz(-pi/2**3) $5;
cx $8, $5;
rz(pi/2**3) $5;
cx $8, $5;
cx $2, $5;
cx $5, $2;
cx $2, $5;
rz(-pi/2**2) $5;
rz(-pi/2**2) $2;
cx $5, $2;
rz(pi/2**2) $2;
cx $5, $2;
h $5;
rz(-pi/2**2) $8;
rz(-pi/2**2) $5;
cx $8, $5;
rz(pi/2**2) $5;
cx $8, $5;
h $8;
c[0] = measure $3;
c[1] = measure $0;
c[2] = measure $1;
c[3] = measure $2;
c[4] = measure $5;
c[5] = measure $8;
