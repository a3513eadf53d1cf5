" Indentation for .loop files: one shiftwidth per open brace.
if exists('b:did_indent')
  finish
endif
let b:did_indent = 1

setlocal indentexpr=LoopIndent(v:lnum)
setlocal indentkeys=0{,0},!^F,o,O
setlocal nosmartindent
let b:undo_indent = 'setlocal indentexpr< indentkeys< smartindent<'

if exists('*LoopIndent')
  finish
endif

" s:braces counts the braces a line opens minus those it closes, ignoring
" comments and strings.
function! s:braces(line) abort
  let l = substitute(a:line, '"\%(\\.\|[^"\\]\)*"', '', 'g')
  let l = substitute(l, '#.*$', '', '')
  return len(substitute(l, '[^{]', '', 'g')) - len(substitute(l, '[^}]', '', 'g'))
endfunction

function! LoopIndent(lnum) abort
  let prev = prevnonblank(a:lnum - 1)
  if prev == 0
    return 0
  endif
  let ind = indent(prev)
  let pl = getline(prev)
  let opened = s:braces(pl)
  " A line that starts with '}' already took its dedent.
  if pl =~# '^\s*}'
    let opened += 1
  endif
  if opened > 0
    let ind += shiftwidth()
  elseif opened < 0
    let ind += opened * shiftwidth()
  endif
  if getline(a:lnum) =~# '^\s*}'
    let ind -= shiftwidth()
  endif
  return ind < 0 ? 0 : ind
endfunction
