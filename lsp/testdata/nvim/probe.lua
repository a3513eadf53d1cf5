-- Headless Neovim probe: start `circa serve` on one .loop file, wait for
-- its diagnostics, ask for a hover and write what came back as JSON.
-- Works with Neovim 0.7 (vim.lsp.start_client, buf_request_sync).
local out = os.getenv("CIRCA_OUT")
local result = { errors = {}, diagnostics = {} }

local ok, err = pcall(function()
  local file = os.getenv("CIRCA_FILE")
  vim.cmd("edit " .. vim.fn.fnameescape(file))
  local buf = vim.api.nvim_get_current_buf()
  local id = vim.lsp.start_client({
    name = "circa",
    cmd = { os.getenv("CIRCA_BIN"), "serve" },
    root_dir = vim.fn.fnamemodify(file, ":h"),
  })
  if not id then
    error("start_client failed")
  end
  vim.lsp.buf_attach_client(buf, id)

  local function code_of(d)
    if d.code then
      return d.code
    end
    if d.user_data and d.user_data.lsp then
      return d.user_data.lsp.code
    end
    return nil
  end
  local want = os.getenv("CIRCA_WANT_CODE")
  vim.wait(30000, function()
    for _, d in ipairs(vim.diagnostic.get(buf)) do
      if code_of(d) == want then
        return true
      end
    end
    return false
  end, 50)
  for _, d in ipairs(vim.diagnostic.get(buf)) do
    table.insert(result.diagnostics, {
      lnum = d.lnum, col = d.col, end_col = d.end_col, message = d.message, code = code_of(d),
    })
  end

  local params = {
    textDocument = { uri = vim.uri_from_bufnr(buf) },
    position = { line = tonumber(os.getenv("CIRCA_HOVER_LINE")), character = tonumber(os.getenv("CIRCA_HOVER_COL")) },
  }
  local replies = vim.lsp.buf_request_sync(buf, "textDocument/hover", params, 10000)
  for _, r in pairs(replies or {}) do
    if r.error then
      table.insert(result.errors, "hover: " .. vim.inspect(r.error))
    elseif r.result and r.result.contents then
      result.hover = r.result.contents.value or vim.inspect(r.result.contents)
    end
  end
  vim.lsp.stop_client(id)
  vim.wait(2000, function() return vim.lsp.get_client_by_id(id) == nil end, 50)
end)
if not ok then
  table.insert(result.errors, tostring(err))
end
local f = assert(io.open(out, "w"))
f:write(vim.fn.json_encode(result))
f:close()
vim.cmd("qa!")
