OPENQASM 3.0;
include "stdgates.inc";
// written by qftplan 0.1.0
// device: full:5
// transform: inverse QFT on 5 qubits, exact
// strategy: routed
// placement: 1,3,4,0,2
// final_placement: 2,0,4,3,1
// placement[k] holds input bit k (weight 2^k) at the start; final_placement[k] holds output bit k at the end
h $2;
rz(-pi/2**2) $0;
rz(-pi/2**2) $2;
cx $0, $2;
rz(pi/2**2) $2;
cx $0, $2;
h $0;
rz(-pi/2**3) $4;
rz(-pi/2**3) $2;
cx $4, $2;
rz(pi/2**3) $2;
cx $4, $2;
rz(-pi/2**2) $4;
rz(-pi/2**2) $0;
cx $4, $0;
rz(pi/2**2) $0;
cx $4, $0;
h $4;
rz(-pi/2**4) $3;
rz(-pi/2**4) $2;
cx $3, $2;
rz(pi/2**4) $2;
cx $3, $2;
rz(-pi/2**3) $3;
rz(-pi/2**3) $0;
cx $3, $0;
rz(pi/2**3) $0;
cx $3, $0;
rz(-pi/2**2) $3;
rz(-pi/2**2) $4;
cx $3, $4;
rz(pi/2**2) $4;
cx $3, $4;
h $3;
rz(-pi/2**5) $1;
rz(-pi/2**5) $2;
cx $1, $2;
rz(pi/2**5) $2;
cx $1, $2;
rz(-pi/2**4) $1;
rz(-pi/2**4) $0;
cx $1, $0;
rz(pi/2**4) $0;
cx $1, $0;
rz(-pi/2**3) $1;
rz(-pi/2**3) $4;
cx $1, $4;
rz(pi/2**3) $4;
cx $1, $4;
rz(-pi/2**2) $1;
rz(-pi/2**2) $3;
cx $1, $3;
rz(pi/2**2) $3;
cx $1, $3;
h $1;
