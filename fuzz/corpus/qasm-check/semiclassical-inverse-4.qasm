OPENQASM 3.0;
include "stdgates.inc";
// written by qftplan 0.1.0
// device: dyn9
// transform: inverse QFT on 4 qubits, exact
// strategy: semiclassical
// placement: 0,1,2,3
// final_placement: 3,2,1,0
// placement[k] holds input bit k (weight 2^k) at the start; final_placement[k] holds output bit k at the end
// readout: semiclassical; final_placement[k] is measured into c[k] (output bit k, weight 2^k) as soon as its corrections are done
bit[4] c;
h $3;
c[0] = measure $3;
if (c[0]) p(-pi/2) $2;
h $2;
c[1] = measure $2;
if (c[0]) p(-pi/2**2) $1;
if (c[1]) p(-pi/2) $1;
h $1;
c[2] = measure $1;
if (c[0]) p(-pi/2**3) $0;
if (c[1]) p(-pi/2**2) $0;
if (c[2]) p(-pi/2) $0;
h $0;
c[3] = measure $0;
