// Normative syntax of DIMACS CNF as accepted by clausegate.
//
// Comments never reach the parser (the lexer skips them), so they may stand anywhere. Clause
// structure (literals up to the terminating zero) and the checks that need numbers -- counts
// within 2^31-1, variables within the declared count, the declared number of clauses, no "-0" --
// are semantic rules applied while the tokens stream past; they are stated here so that this file
// is the whole specification:
//   S1  VARIABLES and CLAUSES are at most 2147483647.
//   S2  A literal is nonzero, its magnitude at most 2147483647 and at most VARIABLES.
//   S3  No literal starts a clause once CLAUSES clauses are complete; no extra empty clause either
//       (a ZERO there is an error at that ZERO), except by S5.
//   S4  At END or EOF the number of clauses equals CLAUSES. A last clause without its zero is
//       accepted (it counts) with a warning.
//   S5  Once CLAUSES clauses are complete, a ZERO that is the first token on its line and the last
//       token of the body (only comments and whitespace follow it, up to EOF or END) is an end
//       marker, as SATLIB's pret files use it: it adds no clause, and a warning
//       (trailing-zero-end-marker) says so. A ZERO sharing a line with an earlier token ("1 0 0"),
//       or followed by any other token (a second ZERO, a literal, anything else), is the extra
//       clause of S3. Before CLAUSES clauses are complete a lone ZERO is an empty clause.
parser grammar DimacsParser;

options { tokenVocab = DimacsLexer; }

dimacs  : header body EOF ;
header  : P CNF H_NUM H_NUM NL? ;
body    : (INT | ZERO)* END? ;
