OPENQASM 3.0;
include "stdgates.inc";
// written by qftplan 0.1.0
// device: ring:6
// transform: QFT on 5 qubits, approximate (degree 2)
// strategy: chain (adjacent network)
// placement: 5,0,1,2,3
// final_placement: 3,2,1,0,5
// placement[k] holds input bit k (weight 2^k) at the start; final_placement[k] holds output bit k at the end
h $3;
rz(pi/2**2) $3;
rz(pi/2**2) $2;
cx $3, $2;
rz(-pi/2**2) $2;
cx $3, $2;
h $2;
rz(pi/2**2) $2;
rz(pi/2**2) $1;
cx $2, $1;
rz(-pi/2**2) $1;
cx $2, $1;
h $1;
rz(pi/2**2) $1;
rz(pi/2**2) $0;
cx $1, $0;
rz(-pi/2**2) $0;
cx $1, $0;
h $0;
rz(pi/2**2) $0;
rz(pi/2**2) $5;
cx $0, $5;
rz(-pi/2**2) $5;
cx $0, $5;
h $5;
