OPENQASM 3.0;
include "stdgates.inc";
// device: grid:3x3
// placement: 0,1,2
// final_placement: 2,1,0
gate a q { nosuch q; }
a $0;
