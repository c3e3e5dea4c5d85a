OPENQASM 3.0;
include "stdgates.inc";
// device: line:4
// transform: inverse QFT on 3 qubits, approximate (degree 0)
// placement: 0,1,2
// final_placement: 0,1,2
h $0;
