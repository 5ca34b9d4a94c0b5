-- Caloris language server client for Neovim.
--
--   require('caloris').setup({ cmd = { 'caloris', 'lsp' } })
--
-- Starts one `caloris lsp` client per project root and attaches every `heat`
-- buffer of that root to it. Works on Neovim 0.7 (vim.lsp.start_client +
-- vim.lsp.buf_attach_client) and uses vim.lsp.start where it exists (0.8+).
-- On attach it sets the usual buffer-local maps (unless `maps = false`) and
-- shows the server's inlay hints (solved temperatures, heat flows, limit
-- verdicts): natively where Neovim has inlay hints (0.10+), otherwise as
-- end-of-line virtual text that follows the server's refreshes.
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
  -- Buffer-local maps set on attach; `false` sets none, a table replaces
  -- single keys (`{ rename = '<F2>' }`, or `false` for one of them).
  maps = {
    hover = 'K',
    definition = 'gd',
    references = 'gr',
    rename = '<leader>rn',
    code_action = '<leader>ca',
    format = '<leader>f',
  },
  -- Show the server's inlay hints (natively, or as end-of-line virtual text
  -- where Neovim has no inlay hints of its own).
  inlay_hints = true,
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

-- Inlay hints as end-of-line virtual text, for Neovim without native ones.
local hint_ns = vim.api.nvim_create_namespace('caloris_inlay_hints')

local function native_hints()
  return vim.lsp.inlay_hint ~= nil and type(vim.lsp.inlay_hint.enable) == 'function'
end

--- Ask the server for the buffer's inlay hints and show each at the end of its line
--- (several on one line are joined). Used where Neovim has no inlay hints.
function M.refresh_hints(bufnr, client)
  if not vim.api.nvim_buf_is_loaded(bufnr) then
    return
  end
  local last = vim.api.nvim_buf_line_count(bufnr)
  local params = {
    textDocument = { uri = vim.uri_from_bufnr(bufnr) },
    range = { start = { line = 0, character = 0 }, ['end'] = { line = last, character = 0 } },
  }
  client.request('textDocument/inlayHint', params, function(err, result)
    if err or not vim.api.nvim_buf_is_loaded(bufnr) then
      return
    end
    vim.api.nvim_buf_clear_namespace(bufnr, hint_ns, 0, -1)
    local by_line = {}
    for _, h in ipairs(result or {}) do
      local label = h.label
      if type(label) == 'table' then
        local parts = {}
        for _, p in ipairs(label) do
          parts[#parts + 1] = p.value
        end
        label = table.concat(parts)
      end
      local line = h.position.line
      by_line[line] = by_line[line] or {}
      table.insert(by_line[line], vim.trim(label))
    end
    local lines = vim.api.nvim_buf_line_count(bufnr)
    for line, labels in pairs(by_line) do
      if line < lines then
        vim.api.nvim_buf_set_extmark(bufnr, hint_ns, line, 0, {
          virt_text = { { '  ' .. table.concat(labels, '  '), 'Comment' } },
          virt_text_pos = 'eol',
        })
      end
    end
  end, bufnr)
end

--- The virtual-text hints of a buffer, as `{ line (0-based), text }` pairs (for tests and
--- for users who want to read them).
function M.shown_hints(bufnr)
  local out = {}
  for _, m in ipairs(vim.api.nvim_buf_get_extmarks(bufnr, hint_ns, 0, -1, { details = true })) do
    local text = {}
    for _, chunk in ipairs(m[4].virt_text or {}) do
      text[#text + 1] = chunk[1]
    end
    out[#out + 1] = { m[2], table.concat(text) }
  end
  return out
end

local function refresh_all(client)
  for _, buf in ipairs(vim.lsp.get_buffers_by_client_id and vim.lsp.get_buffers_by_client_id(client.id) or {}) do
    M.refresh_hints(buf, client)
  end
end

local function set_maps(bufnr)
  local maps = M.config.maps
  if not maps then
    return
  end
  local format = vim.lsp.buf.format and function()
    vim.lsp.buf.format({ bufnr = bufnr })
  end or vim.lsp.buf.formatting
  local actions = {
    hover = vim.lsp.buf.hover,
    definition = vim.lsp.buf.definition,
    references = vim.lsp.buf.references,
    rename = vim.lsp.buf.rename,
    code_action = vim.lsp.buf.code_action,
    format = format,
  }
  for name, fn in pairs(actions) do
    local key = maps[name]
    if key then
      vim.keymap.set('n', key, fn, { buffer = bufnr, silent = true, desc = 'caloris: ' .. name })
    end
  end
end

local function on_attach(client, bufnr)
  set_maps(bufnr)
  if M.config.inlay_hints then
    if native_hints() then
      -- 0.10 takes (enable, filter); earlier nightlies took (bufnr, enable).
      if not pcall(vim.lsp.inlay_hint.enable, true, { bufnr = bufnr }) then
        pcall(vim.lsp.inlay_hint.enable, bufnr, true)
      end
    else
      M.refresh_hints(bufnr, client)
    end
  end
  if M.config.on_attach then
    M.config.on_attach(client, bufnr)
  end
end

local function client_config(root)
  local cfg = M.config
  local capabilities = cfg.capabilities or vim.lsp.protocol.make_client_capabilities()
  local handlers = {}
  if cfg.inlay_hints and not native_hints() then
    -- The server sends a refresh when a solve finishes; redraw the virtual text then.
    capabilities = vim.tbl_deep_extend('force', capabilities, {
      workspace = { inlayHint = { refreshSupport = true } },
    })
    handlers['workspace/inlayHint/refresh'] = function(_, _, ctx)
      local client = vim.lsp.get_client_by_id(ctx.client_id)
      if client then
        refresh_all(client)
      end
      return vim.NIL
    end
  end
  return {
    name = cfg.name,
    cmd = cfg.cmd,
    root_dir = root,
    workspace_folders = {
      { uri = vim.uri_from_fname(root), name = root },
    },
    settings = cfg.settings,
    init_options = cfg.init_options,
    capabilities = capabilities,
    handlers = handlers,
    on_attach = on_attach,
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
