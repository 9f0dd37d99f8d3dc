// Normative syntax of DIMACS CNF as accepted by clausegate.
//
// Comments never reach the parser (the lexer skips them), so they may stand anywhere. Clause
// structure (literals up to the terminating zero) and the checks that need numbers -- counts
// within 2^31-1, variables within the declared count, the declared number of clauses, no "-0" --
// are semantic rules applied while the tokens stream past; they are stated here so that this file
// is the whole specification:
//   S1  VARIABLES and CLAUSES are at most 2147483647.
//   S2  A literal is nonzero, its magnitude at most 2147483647 and at most VARIABLES.
//   S3  No literal starts a clause once CLAUSES clauses are complete; no extra empty clause either.
//   S4  At END or EOF the number of clauses equals CLAUSES. A last clause without its zero is
//       accepted (it counts) with a warning.
parser grammar DimacsParser;

options { tokenVocab = DimacsLexer; }

dimacs  : header body EOF ;
header  : P CNF H_NUM H_NUM NL? ;
body    : (INT | ZERO)* END? ;
