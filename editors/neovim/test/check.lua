-- Headless check of the Neovim plugin (works on Neovim 0.7.2 and later).
-- Run from the repository root:
--   nvim --headless --clean -n --cmd 'set rtp^=editors/neovim' -c 'luafile editors/neovim/test/check.lua'
-- Prints "ok - ..." / "not ok - ..." lines and exits non-zero on failure.
local here = vim.fn.fnamemodify(debug.getinfo(1, 'S').source:sub(2), ':p:h')
local editors = vim.fn.fnamemodify(here, ':h:h')
local failures, passed = 0, 0

local function report(ok, what, detail)
  if ok then
    passed = passed + 1
    io.stdout:write('ok - ' .. what .. '\n')
  else
    failures = failures + 1
    io.stdout:write('not ok - ' .. what .. (detail and (': ' .. detail) or '') .. '\n')
  end
end

local function finish()
  io.stdout:write(('nvim: %d passed, %d failed\n'):format(passed, failures))
  for _, c in ipairs(vim.lsp.get_active_clients()) do
    c.stop(true)
  end
  vim.cmd(failures == 0 and 'qall!' or 'cquit 1')
end

local ok_all, err = pcall(function()
  local v = vim.version()
  io.stdout:write(('Neovim %d.%d.%d, vim.lsp.start %s\n'):format(
    v.major, v.minor, v.patch, vim.lsp.start and 'present' or 'absent (using start_client)'))

  -- Filetype, ftplugin and syntax on the sample model
  vim.cmd('edit ' .. vim.fn.fnameescape(editors .. '/sample.heat'))
  report(vim.bo.filetype == 'heat', 'filetype of sample.heat is heat', vim.bo.filetype)
  report(vim.bo.commentstring == '# %s', "commentstring is '# %s'", vim.bo.commentstring)
  report(vim.b.current_syntax == 'heat', 'syntax/heat.vim is loaded', tostring(vim.b.current_syntax))

  -- highlight group (and the standard group it links to) of `text` on line `lnum`
  local function group_at(lnum, text)
    local line = vim.fn.getline(lnum)
    local col = line:find(text, 1, true)
    if not col then
      return nil, nil
    end
    local id = vim.fn.synID(lnum, col, 1)
    local name = vim.fn.synIDattr(id, 'name')
    local link = vim.fn.execute('highlight ' .. name):match('links to (%S+)')
    return name, link
  end
  local function expect(lnum, text, group, std)
    local name, link = group_at(lnum, text)
    report(name == group and link == std, ('%-16s -> %s -> %s'):format(text, group, std),
      ('got %s -> %s'):format(tostring(name), tostring(link)))
  end
  expect(1, '# LED', 'heatComment', 'Comment')
  expect(2, 'title', 'heatKeyword', 'Keyword')
  expect(2, '"LED', 'heatString', 'String')
  expect(4, 'sink_area', 'heatDefName', 'Identifier')
  expect(4, '0.021', 'heatNumber', 'Number')
  expect(4, 'm^2', 'heatUnit', 'Type')
  expect(6, 'aluminium', 'heatTypeName', 'Type')
  expect(6, 'W/(m*K)', 'heatUnit', 'Type')
  expect(8, '°C', 'heatUnit', 'Type')
  expect(12, 'contact', 'heatFunction', 'Function')
  expect(12, 'to', 'heatKeyword', 'Keyword')
  expect(15, 'temperature', 'heatFunction', 'Function')
  expect(15, '<', 'heatOperator', 'Operator')

  -- Language client against a stand-in server (node editors/test/fake-lsp.js)
  local tmp = vim.fn.tempname()
  vim.fn.mkdir(tmp .. '/.git', 'p')
  local log = tmp .. '/lsp.log'
  vim.fn.writefile(vim.fn.readfile(editors .. '/sample.heat'), tmp .. '/a.heat')
  vim.fn.writefile({ 'node extra' }, tmp .. '/b.heat')
  vim.env.FAKE_LSP_LOG = log

  vim.cmd('silent! %bwipeout!')
  local caloris = require('caloris')
  caloris.setup({ cmd = { 'node', editors .. '/test/fake-lsp.js' } })
  report(caloris.config.cmd[1] == 'node' and #caloris.config.cmd == 2, 'setup{cmd} replaces the default cmd')

  vim.cmd('edit ' .. vim.fn.fnameescape(tmp .. '/a.heat'))
  local buf_a = vim.api.nvim_get_current_buf()
  local function clients_of(buf)
    local ids = {}
    for id, c in pairs(vim.lsp.buf_get_clients(buf)) do
      if c.name == 'caloris' then
        table.insert(ids, c.id or id)
      end
    end
    return ids
  end
  local attached = vim.wait(10000, function()
    local ids = clients_of(buf_a)
    local c = ids[1] and vim.lsp.get_client_by_id(ids[1])
    return c ~= nil and c.initialized == true
  end, 50)
  report(attached, 'client started and initialized for a.heat')
  local ids_a = clients_of(buf_a)
  if ids_a[1] then
    local c = vim.lsp.get_client_by_id(ids_a[1])
    report(c.config.root_dir == tmp, 'root dir is the folder with .git', tostring(c.config.root_dir))
  end

  vim.cmd('edit ' .. vim.fn.fnameescape(tmp .. '/b.heat'))
  local buf_b = vim.api.nvim_get_current_buf()
  vim.wait(5000, function() return #clients_of(buf_b) > 0 end, 50)
  local ids_b = clients_of(buf_b)
  report(#ids_a == 1 and #ids_b == 1 and ids_a[1] == ids_b[1], 'second buffer in the same root reuses the client',
    vim.inspect({ ids_a, ids_b }))

  local seen = function()
    local n = 0
    if vim.fn.filereadable(log) == 1 then
      for _, l in ipairs(vim.fn.readfile(log)) do
        if l == 'textDocument/didOpen' then n = n + 1 end
      end
    end
    return n
  end
  vim.wait(5000, function() return seen() >= 2 end, 50)
  local methods = vim.fn.filereadable(log) == 1 and vim.fn.readfile(log) or {}
  report(methods[1] == 'initialize' and vim.tbl_contains(methods, 'initialized'), 'server got initialize, initialized',
    table.concat(methods, ','))
  report(seen() == 2, 'server got didOpen for both buffers', table.concat(methods, ','))
end)

if not ok_all then
  report(false, 'check script raised an error', tostring(err))
end
finish()
