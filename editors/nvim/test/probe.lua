-- Headless probe for the editors tests: opens $CIRCA_PROBE_FILE, reports its
-- filetype, the highlight group at each probed text, the re-indented text of
-- $CIRCA_PROBE_MESSY and, when $CIRCA_PROBE_LSP is set, whether the circa
-- client attached and which diagnostics it published. Writes JSON to
-- $CIRCA_PROBE_OUT and quits.
local out = { errors = {} }
local function fail(msg) table.insert(out.errors, msg) end

local function finish()
  local f = io.open(os.getenv("CIRCA_PROBE_OUT"), "w")
  f:write(vim.fn.json_encode(out))
  f:close()
  vim.cmd("qall!")
end

-- With $CIRCA_PROBE_FAKESTART, vim.lsp.start (Neovim 0.8+) is replaced by a
-- recorder, to test the plugin's newer path on any version.
if os.getenv("CIRCA_PROBE_FAKESTART") then
  vim.g.circa = { cmd = { "sh", "serve" }, settings = { voidFraction = "zivi", limits = { exit_quality = "0.4" } } }
  vim.lsp.start = function(cfg, opts)
    out.started = { name = cfg.name, cmd = cfg.cmd, root = cfg.root_dir, init = cfg.init_options,
      settings = cfg.settings, bufnr = opts and opts.bufnr or -1 }
    return 1
  end
end

local ok, err = pcall(function()
  vim.cmd("filetype plugin indent on")
  vim.cmd("syntax on")
  vim.cmd("edit " .. vim.fn.fnameescape(os.getenv("CIRCA_PROBE_FILE")))
  out.filetype = vim.bo.filetype
  out.commentstring = vim.bo.commentstring

  -- Highlight groups: each probe is {text, occurrence}; the group is taken at
  -- the text's first character.
  out.groups = {}
  local lines = vim.api.nvim_buf_get_lines(0, 0, -1, false)
  for _, p in ipairs(vim.fn.json_decode(os.getenv("CIRCA_PROBE_TEXTS") or "[]")) do
    local text, want = p[1], p[2]
    local seen, found = 0, nil
    for lnum, line in ipairs(lines) do
      local init = 1
      while true do
        local s = string.find(line, text, init, true)
        if not s then break end
        seen = seen + 1
        if seen == want then found = { lnum, s } break end
        init = s + 1
      end
      if found then break end
    end
    if found then
      -- The syntax item there and the standard group it links to.
      local name = vim.fn.synIDattr(vim.fn.synID(found[1], found[2], 1), "name")
      local group = name
      if name ~= "" then
        group = vim.fn.execute("highlight " .. name):match("links to (%w+)") or name
      end
      table.insert(out.groups, { text, group })
    else
      table.insert(out.groups, { text, "(text not found)" })
    end
  end

  local messy = os.getenv("CIRCA_PROBE_MESSY")
  if messy and messy ~= "" then
    vim.cmd("enew")
    vim.bo.filetype = "loop"
    vim.api.nvim_buf_set_lines(0, 0, -1, false, vim.split(messy, "\n", true))
    vim.cmd("normal! gg=G")
    out.indented = table.concat(vim.api.nvim_buf_get_lines(0, 0, -1, false), "\n")
    vim.cmd("bwipeout!")
  end
end)
if not ok then fail(tostring(err)) end

if not os.getenv("CIRCA_PROBE_LSP") then
  finish()
  return
end

-- Wait for the client to attach and publish diagnostics for the buffer.
local buf = vim.fn.bufnr(os.getenv("CIRCA_PROBE_FILE"))
local got = vim.wait(20000, function()
  return #vim.diagnostic.get(buf) > 0
end, 100)
local names = {}
for _, c in pairs(vim.lsp.buf_get_clients(buf)) do table.insert(names, c.name) end
out.clients = names
out.diagnostics = {}
for _, d in ipairs(vim.diagnostic.get(buf)) do
  table.insert(out.diagnostics, { lnum = d.lnum, col = d.col, message = d.message, code = d.code and tostring(d.code) or "" })
end
if not got then fail("no diagnostics within 20 s") end
finish()
