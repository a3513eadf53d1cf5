" Buffer settings for .loop files, and the circa language server.
if exists('b:did_ftplugin')
  finish
endif
let b:did_ftplugin = 1

setlocal commentstring=#\ %s
setlocal comments=:#
setlocal formatoptions-=t formatoptions+=croql
setlocal expandtab shiftwidth=2 softtabstop=2
let b:undo_ftplugin = 'setlocal commentstring< comments< formatoptions< expandtab< shiftwidth< softtabstop<'

" Start (or join) `circa serve` unless the user turned it off with
" let g:circa_lsp = v:false
if has('nvim-0.7') && get(g:, 'circa_lsp', v:true)
  lua require('circa').attach(vim.api.nvim_get_current_buf())
endif
