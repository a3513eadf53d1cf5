" Highlighting for .loop files with the standard groups, so colours come
" from the colour scheme.
if exists('b:current_syntax')
  finish
endif

syn case match

syn match   loopOperator  "[-+*/^=]"
syn match   loopDelimiter "[{}(),;]"

" Names: the first word of a statement is a field; declarations name a thing.
syn match   loopField     "\v(^|[{;])\s*\zs\h\w*"
syn match   loopName      "\h\w*" contained
syn match   loopNodeRef   "\h\w*" contained
syn match   loopPartRef   "\h\w*" contained

syn keyword loopStatement include param part loop case limits methods nextgroup=loopName skipwhite
syn keyword loopComponent pipe evaporator condenser bend fitting reservoir nextgroup=loopName skipwhite
syn keyword loopComponent node junction nextgroup=loopName skipwhite
syn keyword loopKeyword   from to at nextgroup=loopNodeRef skipwhite
syn keyword loopKeyword   use nextgroup=loopPartRef skipwhite
syn keyword loopKeyword   nominal

" fluid NAME, with an optional stereo-isomer suffix: R1234ze(E).
syn match   loopFluidField "\v(^|[{;])\s*\zsfluid>" nextgroup=loopTableKw,loopFluid skipwhite
syn keyword loopTableKw   table contained
syn match   loopFluid     "\v\h\w*(\([A-Z]\))?" contained

" Numbers and the unit that follows them (with or without a space), and the
" unit after a vector's closing parenthesis.
syn match   loopNumber    "\v<\d+(\.\d*)?([eE][+-]?\d+)?" nextgroup=loopUnit skipwhite
syn match   loopNumber    "\v(\w|\.)@<!\.\d+([eE][+-]?\d+)?" nextgroup=loopUnit skipwhite
syn match   loopUnit      "\v(from>|to>|at>|nominal>)@![[:alpha:]_%°µμΔ]([^[:space:]#,;{}="()]|\([^()#]*\))*" contained
syn match   loopUnit      "\v\)@<=\s*\zs(from>|to>|at>|nominal>)@![[:alpha:]_%°µμΔ]([^[:space:]#,;{}="()]|\([^()#]*\))*"

syn region  loopString    start=+"+ skip=+\\\\\|\\"+ end=+"\|$+ contains=loopEscape oneline
syn match   loopEscape    +\\[\\"]+ contained

" Comments; "# allow: RULE, RULE" silences findings on its line.
syn match   loopComment   "#.*$" contains=loopAllow,@Spell
syn match   loopAllow     "\v#\s*\zsallow\s*:.*$" contained

hi def link loopComment    Comment
hi def link loopAllow      Special
hi def link loopString     String
hi def link loopEscape     Special
hi def link loopNumber     Number
hi def link loopUnit       Type
hi def link loopStatement  Keyword
hi def link loopKeyword    Keyword
hi def link loopTableKw    Keyword
hi def link loopComponent  Type
hi def link loopField      Identifier
hi def link loopFluidField Identifier
hi def link loopFluid      Constant
hi def link loopName       Function
hi def link loopNodeRef    Identifier
hi def link loopPartRef    Identifier
hi def link loopOperator   Operator
hi def link loopDelimiter  Delimiter

let b:current_syntax = 'loop'
