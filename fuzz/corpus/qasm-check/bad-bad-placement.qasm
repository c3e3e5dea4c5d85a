OPENQASM 3.0;
// placement: 1,,2
// final_placement: 2,1,0
h $0;
