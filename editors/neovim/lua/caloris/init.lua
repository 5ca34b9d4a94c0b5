-- Caloris language server client for Neovim.
--
--   require('caloris').setup({ cmd = { 'caloris', 'lsp' } })
--
-- Starts one `caloris lsp` client per project root and attaches every `heat`
-- buffer of that root to it. Works on Neovim 0.7 (vim.lsp.start_client +
-- vim.lsp.buf_attach_client) and uses vim.lsp.start where it exists (0.8+).
local M = {}

local defaults = {
  -- Command that starts the language server (stdio).
  cmd = { 'caloris', 'lsp' },
  -- Filetypes the client attaches to.
  filetypes = { 'heat' },
  -- Files or folders that mark a project root, searched upwards from the
  -- buffer's file; without one the file's own folder is the root.
  root_markers = { '.git' },
  -- Passed through to the client.
  name = 'caloris',
  settings = {},
  init_options = nil,
  capabilities = nil,
  on_attach = nil,
  -- Warn once when cmd[1] is not executable.
  notify_missing = true,
}

M.config = vim.deepcopy(defaults)

-- root dir -> client id (only used where vim.lsp.start does not exist)
local clients_by_root = {}
local warned_missing = false

local function path_exists(p)
  return vim.loop.fs_stat(p) ~= nil
end

local function parent(dir)
  local up = vim.fn.fnamemodify(dir, ':h')
  if up == dir then
    return nil
  end
  return up
end

--- Project root for a buffer: the nearest folder with one of root_markers,
--- else the folder of the file (or the current directory for unnamed buffers).
function M.root_dir(bufnr)
  local fname = vim.api.nvim_buf_get_name(bufnr or 0)
  if fname == '' then
    return vim.loop.cwd()
  end
  local start = vim.fn.fnamemodify(fname, ':p:h')
  local dir = start
  while dir do
    for _, marker in ipairs(M.config.root_markers or {}) do
      if path_exists(dir .. '/' .. marker) then
        return dir
      end
    end
    dir = parent(dir)
  end
  return start
end

local function client_config(root)
  local cfg = M.config
  return {
    name = cfg.name,
    cmd = cfg.cmd,
    root_dir = root,
    workspace_folders = {
      { uri = vim.uri_from_fname(root), name = root },
    },
    settings = cfg.settings,
    init_options = cfg.init_options,
    capabilities = cfg.capabilities or vim.lsp.protocol.make_client_capabilities(),
    on_attach = cfg.on_attach,
    on_exit = function(_, _, client_id)
      if clients_by_root[root] == client_id then
        clients_by_root[root] = nil
      end
    end,
  }
end

local function alive(client_id)
  local client = client_id and vim.lsp.get_client_by_id(client_id)
  return client ~= nil and not client.is_stopped()
end

--- Attach the Caloris client to a buffer, starting it for the buffer's root
--- when needed. Returns the client id, or nil when it could not be started.
function M.attach(bufnr)
  bufnr = (bufnr == nil or bufnr == 0) and vim.api.nvim_get_current_buf() or bufnr
  local cmd = M.config.cmd
  if type(cmd) ~= 'table' or #cmd == 0 then
    vim.notify('caloris: setup{ cmd = ... } must be a non-empty list', vim.log.levels.ERROR)
    return nil
  end
  if vim.fn.executable(cmd[1]) ~= 1 then
    if M.config.notify_missing and not warned_missing then
      warned_missing = true
      vim.notify(
        ("caloris: '%s' is not executable; set cmd in require('caloris').setup{}"):format(cmd[1]),
        vim.log.levels.WARN
      )
    end
    return nil
  end

  local root = M.root_dir(bufnr)

  if vim.lsp.start then
    -- Neovim 0.8+: vim.lsp.start reuses a client with the same name and root_dir.
    return vim.lsp.start(client_config(root), { bufnr = bufnr })
  end

  -- Neovim 0.7: one client per root, started by hand.
  local id = clients_by_root[root]
  if not alive(id) then
    id = vim.lsp.start_client(client_config(root))
    if not id then
      return nil
    end
    clients_by_root[root] = id
  end
  vim.lsp.buf_attach_client(bufnr, id)
  return id
end

--- Configure the client and attach it to `heat` buffers (also those already open).
function M.setup(opts)
  opts = opts or {}
  M.config = vim.tbl_deep_extend('force', vim.deepcopy(defaults), opts)
  -- Lists replace the defaults instead of being merged index by index.
  for _, key in ipairs({ 'cmd', 'filetypes', 'root_markers' }) do
    if opts[key] ~= nil then
      M.config[key] = opts[key]
    end
  end
  warned_missing = false

  local group = vim.api.nvim_create_augroup('caloris_lsp', { clear = true })
  vim.api.nvim_create_autocmd('FileType', {
    group = group,
    pattern = M.config.filetypes,
    callback = function(args)
      M.attach(args.buf)
    end,
    desc = 'Attach the Caloris language server',
  })

  local wanted = {}
  for _, ft in ipairs(M.config.filetypes) do
    wanted[ft] = true
  end
  for _, buf in ipairs(vim.api.nvim_list_bufs()) do
    if vim.api.nvim_buf_is_loaded(buf) and wanted[vim.bo[buf].filetype] then
      M.attach(buf)
    end
  end
end

return M
