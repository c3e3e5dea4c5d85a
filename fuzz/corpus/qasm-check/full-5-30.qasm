OPENQASM 3.0;
include "stdgates.inc";
// written by qftplan 0.1.0
// device: full:5
// transform: QFT on 5 qubits, approximate (degree 2)
// strategy: chain (adjacent network)
// placement: 2,0,4,3,1
// final_placement: 1,3,4,0,2
// placement[k] holds input bit k (weight 2^k) at the start; final_placement[k] holds output bit k at the end
h $1;
rz(pi/2**2) $1;
rz(pi/2**2) $3;
cx $1, $3;
rz(-pi/2**2) $3;
cx $1, $3;
h $3;
rz(pi/2**2) $3;
rz(pi/2**2) $4;
cx $3, $4;
rz(-pi/2**2) $4;
cx $3, $4;
h $4;
rz(pi/2**2) $4;
rz(pi/2**2) $0;
cx $4, $0;
rz(-pi/2**2) $0;
cx $4, $0;
h $0;
rz(pi/2**2) $0;
rz(pi/2**2) $2;
cx $0, $2;
rz(-pi/2**2) $2;
cx $0, $2;
h $2;
