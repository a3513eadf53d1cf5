# circa .loop files for Kakoune: filetype, highlighting with the standard
# faces (colours come from the colour scheme), '#' comments and brace
# indentation.  Source it from kakrc, or put it in the autoload directory.

# comment_line comes with the standard scripts; declare it when they are not loaded.
try %{ declare-option -hidden str comment_line '#' }

hook global BufCreate .*[.]loop %{
    set-option buffer filetype loop
}

# (The block is delimited by %[ ] because it mentions a lone brace.)
hook global WinSetOption filetype=loop %[
    require-module loop
    set-option window comment_line '#'
    set-option window indentwidth 2
    hook -group loop-trim-indent window ModeChange pop:insert:.* loop-trim-indent
    hook -group loop-indent window InsertChar \n loop-indent-on-new-line
    hook -group loop-indent window InsertChar \} loop-indent-on-closing-brace
    hook -once -always window WinSetOption filetype=.* %{ remove-hooks window loop-.+ }
]

hook -group loop-highlight global WinSetOption filetype=loop %{
    add-highlighter window/loop ref loop
    hook -once -always window WinSetOption filetype=.* %{ remove-highlighter window/loop }
}

provide-module loop %§

add-highlighter shared/loop regions
add-highlighter shared/loop/code default-region group
add-highlighter shared/loop/string region '"' (?<!\\)(\\\\)*" fill string
add-highlighter shared/loop/allow region '#\h*allow\h*:' '$' fill meta
add-highlighter shared/loop/comment region '#' '$' fill comment

# Declarations and the names they introduce.
add-highlighter shared/loop/code/ regex '(?:^|[{;])\h*([A-Za-z_]\w*)' 1:attribute
add-highlighter shared/loop/code/ regex '(?:^|[{;])\h*(include|param|part|loop|case|limits|methods)\b(?:\h+([A-Za-z_]\w*))?' 1:keyword 2:type
add-highlighter shared/loop/code/ regex '(?:^|[{;])\h*(node|junction)\b(?:\h+([A-Za-z_]\w*))?' 1:keyword 2:variable
add-highlighter shared/loop/code/ regex '(?:^|[{;])\h*(pipe|evaporator|condenser|bend|fitting|reservoir)\b(?:\h+([A-Za-z_]\w*))?' 1:keyword 2:function
add-highlighter shared/loop/code/ regex '(?:^|[{;])\h*(use)\h+([A-Za-z_]\w*)' 1:keyword 2:type
add-highlighter shared/loop/code/ regex '(?:^|[{;])\h*fluid\h+(table)\b' 1:keyword
add-highlighter shared/loop/code/ regex '(?:^|[{;])\h*fluid\h+((?!table\W)[A-Za-z_]\w*(?:\([A-Z]\))?)' 1:value
add-highlighter shared/loop/code/ regex '(?:^|[{;])\h*(?:void_fraction|friction|single_phase|chf)\h+([A-Za-z_]\w*)' 1:value
add-highlighter shared/loop/code/ regex '\b(from|to|at)\b(?:\h+([A-Za-z_]\w*))?' 1:keyword 2:variable
add-highlighter shared/loop/code/ regex '\bnominal\b' 0:keyword

# Numbers and their units (a unit runs to the first blank outside
# parentheses), and the unit after a vector's closing parenthesis.
add-highlighter shared/loop/code/ regex '[-+*/^=]' 0:operator
add-highlighter shared/loop/code/ regex '(?<![\w.])(\d+(?:\.\d*)?(?:[eE][+-]?\d+)?|\.\d+(?:[eE][+-]?\d+)?)(?:\h*((?!from\W)(?!to\W)(?!at\W)(?!nominal\W)[A-Za-z_%°µμΔ](?:[^\s#,;{}="()]|\([^()#\n]*\))*))?' 1:value 2:type
add-highlighter shared/loop/code/ regex '(?<=\))\h*((?!from\W)(?!to\W)(?!at\W)(?!nominal\W)[A-Za-z_%°µμΔ](?:[^\s#,;{}="()]|\([^()#\n]*\))*)' 1:type

define-command -hidden loop-trim-indent %{
    # remove trailing white spaces
    try %{ execute-keys -draft -itersel x s \h+$ <ret> d }
}

# (Bodies are delimited by %[ ] because they mention lone braces.)
define-command -hidden loop-indent-on-new-line %[
    evaluate-commands -draft -itersel %[
        # copy the previous line's indent
        try %{ execute-keys -draft <semicolon> K <a-&> }
        # trim trailing blanks on the previous line
        try %{ execute-keys -draft k x s \h+$ <ret> d }
        # indent after a line that opens a block (comments aside)
        try %[ execute-keys -draft k x <a-k> ^[^#\n]*\{\h*(#[^\n]*)?\n <ret> j <a-gt> ]
    ]
]

define-command -hidden loop-indent-on-closing-brace %[
    evaluate-commands -draft -itersel %[
        # align a lone closing brace with the line that opened its block
        try %[ execute-keys -draft <a-h> <a-k> ^\h+\}$ <ret> h m <a-S> 1<a-&> ]
    ]
]

§
