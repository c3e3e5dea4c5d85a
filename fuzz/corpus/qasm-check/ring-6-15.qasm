OPENQASM 3.0;
include "stdgates.inc";
// written by qftplan 0.1.0
// device: ring:6
// transform: inverse QFT on 5 qubits, exact
// strategy: chain (reversal network)
// placement: 5,0,1,2,3
// final_placement: 5,0,1,2,3
// placement[k] holds input bit k (weight 2^k) at the start; final_placement[k] holds output bit k at the end
h $3;
rz(-pi/2**2) $2;
rz(-pi/2**2) $3;
cx $2, $3;
rz(pi/2**2) $3;
cx $3, $2;
cx $2, $3;
rz(-pi/2**3) $1;
rz(-pi/2**3) $2;
cx $1, $2;
rz(pi/2**3) $2;
cx $2, $1;
cx $1, $2;
h $3;
rz(-pi/2**2) $2;
rz(-pi/2**2) $3;
cx $2, $3;
rz(pi/2**2) $3;
cx $3, $2;
cx $2, $3;
rz(-pi/2**4) $0;
rz(-pi/2**4) $1;
cx $0, $1;
rz(pi/2**4) $1;
cx $1, $0;
cx $0, $1;
rz(-pi/2**3) $1;
rz(-pi/2**3) $2;
cx $1, $2;
rz(pi/2**3) $2;
cx $2, $1;
cx $1, $2;
rz(-pi/2**5) $5;
rz(-pi/2**5) $0;
cx $5, $0;
rz(pi/2**5) $0;
cx $0, $5;
cx $5, $0;
h $3;
rz(-pi/2**2) $2;
rz(-pi/2**2) $3;
cx $2, $3;
rz(pi/2**2) $3;
cx $3, $2;
cx $2, $3;
rz(-pi/2**4) $0;
rz(-pi/2**4) $1;
cx $0, $1;
rz(pi/2**4) $1;
cx $1, $0;
cx $0, $1;
rz(-pi/2**3) $1;
rz(-pi/2**3) $2;
cx $1, $2;
rz(pi/2**3) $2;
cx $2, $1;
cx $1, $2;
h $3;
rz(-pi/2**2) $2;
rz(-pi/2**2) $3;
cx $2, $3;
rz(pi/2**2) $3;
cx $3, $2;
cx $2, $3;
h $3;
