-- circa language server for .loop buffers. Works on Neovim 0.7 (start_client
-- and buf_attach_client) and on later versions (vim.lsp.start).
--
-- Options, set before a .loop file is opened:
--   vim.g.circa = {
--     cmd = { "circa", "serve" },          -- the server command
--     settings = {                         -- sent as initializationOptions
--       voidFraction = "zivi",             -- and workspace/didChangeConfiguration
--       friction = "friedel",
--       limits = { exit_quality = "0.4", tilt_margin = "8 deg" },
--       inlayHints = true,
--       marginChecks = "auto",             -- or "always", "never"
--     },
--   }
local M = {}

local clients = {} -- root directory -> client id (Neovim 0.7 path)

local function options()
  local o = vim.g.circa or {}
  return {
    cmd = o.cmd or { "circa", "serve" },
    settings = o.settings or vim.empty_dict(),
  }
end

-- root returns the directory holding .git above the buffer's file, else the
-- file's own directory.
function M.root(bufnr)
  local name = vim.api.nvim_buf_get_name(bufnr)
  local dir = name ~= "" and vim.fn.fnamemodify(name, ":p:h") or vim.fn.getcwd()
  local git = vim.fn.finddir(".git", dir .. ";")
  if git == "" then
    git = vim.fn.findfile(".git", dir .. ";") -- worktrees and submodules
  end
  if git ~= "" then
    return vim.fn.fnamemodify(git, ":p:h:h"):gsub("/$", "")
  end
  return dir
end

local function config(bufnr)
  local o = options()
  return {
    name = "circa",
    cmd = o.cmd,
    root_dir = M.root(bufnr),
    init_options = o.settings,
    settings = { circa = o.settings },
  }
end

-- attach starts the server for the buffer's root, or reuses the running one.
function M.attach(bufnr)
  if vim.fn.executable(options().cmd[1]) ~= 1 then
    vim.notify_once("circa: " .. options().cmd[1] .. " not found; set vim.g.circa.cmd", vim.log.levels.WARN)
    return nil
  end
  local cfg = config(bufnr)
  if vim.lsp.start then
    return vim.lsp.start(cfg, { bufnr = bufnr })
  end
  local id = clients[cfg.root_dir]
  if id == nil or vim.lsp.get_client_by_id(id) == nil or vim.lsp.client_is_stopped(id) then
    id = vim.lsp.start_client(cfg)
    clients[cfg.root_dir] = id
  end
  if id then
    vim.lsp.buf_attach_client(bufnr, id)
  end
  return id
end

-- update sends new settings to every running circa client.
function M.update(settings)
  local o = vim.g.circa or {}
  o.settings = settings
  vim.g.circa = o
  for _, client in pairs(vim.lsp.get_active_clients()) do
    if client.name == "circa" then
      client.notify("workspace/didChangeConfiguration", { settings = { circa = settings } })
    end
  end
end

return M
