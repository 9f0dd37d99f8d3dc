// Normative lexical grammar of DIMACS CNF as accepted by clausegate.
//
// Based on the 1993 DIMACS challenge "Satisfiability Suggested Format", with the common-practice
// extensions that real files use: comment lines anywhere, clauses spanning lines, CRLF line ends,
// and the SATLIB end marker '%' after which the rest of the file is ignored.
//
// Token boundaries are whitespace (space, tab, CR, LF). A run of other characters that is not a
// number is a WORD token, so that "3x", "1.5" or "--2" reach the parser as one offending token
// and every error lands on the first character of what the user wrote.
lexer grammar DimacsLexer;

// 'c' starts a comment running to the end of its line (LF; a CR inside is part of it), wherever
// a token may start.
COMMENT : 'c' ~[\n]* -> skip ;
// 'p' alone opens the problem line; the header has its own mode because there 'cnf' is a
// keyword and the line end is significant.
P       : 'p' -> pushMode(HEADER) ;
// The SATLIB end marker: everything after it is ignored (the '0' line that follows is NOT a clause).
END     : '%' -> mode(AFTER_END) ;
// One or more zeros terminate a clause. Listed before INT so that "0" is a terminator. (A lone
// ZERO after the declared clauses may also end the input: rule S5 in DimacsParser.g4.)
ZERO    : '0'+ ;
INT     : '-'? [0-9]+ ;
WS      : [ \t\r\n]+ -> skip ;
WORD    : ~[ \t\r\n]+ ;

mode HEADER;
H_WS    : [ \t]+ -> skip ;
// A CR that does not end a line is plain whitespace.
H_CR    : '\r' -> skip ;
NL      : '\r'? '\n' -> popMode ;
CNF     : 'cnf' ;
H_NUM   : [0-9]+ ;
H_WORD  : ~[ \t\r\n]+ ;

mode AFTER_END;
REST    : [\u0000-\u{10FFFF}]+ -> skip ;
