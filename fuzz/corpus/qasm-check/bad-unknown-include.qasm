OPENQASM 3.0;
include "mine.inc";
h $0;
