" .loop files describe passive two-phase cooling loops for circa.
autocmd BufRead,BufNewFile *.loop setfiletype loop
