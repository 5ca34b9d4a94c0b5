-- Real-client check: the shipped plugin starts the real `caloris lsp` and Neovim's own LSP
-- client talks to it. Run by `cargo test --test lsp_neovim` (tests/lsp_neovim.rs), which sets
--   CALORIS_BIN   the built caloris binary
--   CALORIS_MODEL a copy of examples/led_lamp.heat in a temporary project folder
-- and starts: nvim --headless --clean -n --cmd 'set rtp^=editors/neovim' -c 'luafile <this>'
-- Prints "ok - ..." / "not ok - ..." lines and exits non-zero on any failure.
local failures, passed = 0, 0
local function report(ok, what, detail)
  if ok then
    passed = passed + 1
    io.stdout:write('ok - ' .. what .. '\n')
  else
    failures = failures + 1
    io.stdout:write('not ok - ' .. what .. (detail and (': ' .. tostring(detail)) or '') .. '\n')
  end
end

local function finish()
  io.stdout:write(('nvim lsp: %d passed, %d failed\n'):format(passed, failures))
  for _, c in ipairs(vim.lsp.get_active_clients()) do
    c.stop(true)
  end
  vim.cmd(failures == 0 and 'qall!' or 'cquit 1')
end

local ok_all, err = pcall(function()
  local bin, model = os.getenv('CALORIS_BIN'), os.getenv('CALORIS_MODEL')
  assert(bin and model, 'CALORIS_BIN and CALORIS_MODEL must be set')
  require('caloris').setup({ cmd = { bin, 'lsp' } })
  vim.cmd('edit ' .. vim.fn.fnameescape(model))
  local buf = vim.api.nvim_get_current_buf()
  report(vim.bo.filetype == 'heat', 'the example opens as filetype heat', vim.bo.filetype)

  local client
  local started = vim.wait(20000, function()
    for _, c in pairs(vim.lsp.buf_get_clients(buf)) do
      if c.name == 'caloris' and c.initialized then
        client = c
        return true
      end
    end
    return false
  end, 50)
  report(started, 'the plugin started caloris lsp and the client initialized')
  if not started then
    return
  end
  report(client.server_capabilities ~= nil or client.resolved_capabilities ~= nil, 'server capabilities received')

  -- Position of `text` on the line starting with `prefix` (0-based line, byte column).
  local function find(prefix, text)
    for i, line in ipairs(vim.api.nvim_buf_get_lines(buf, 0, -1, false)) do
      if line:sub(1, #prefix) == prefix then
        local col = line:find(text, 1, true)
        if col then
          return i - 1, col - 1
        end
      end
    end
    error('not found: ' .. prefix .. ' / ' .. text)
  end
  local function request(method, line, col, extra)
    vim.api.nvim_win_set_cursor(0, { line + 1, col })
    local params = vim.lsp.util.make_position_params()
    for k, v in pairs(extra or {}) do
      params[k] = v
    end
    local res = vim.lsp.buf_request_sync(buf, method, params, 20000)
    for _, r in pairs(res or {}) do
      if r.result ~= nil then
        return r.result, r.err
      end
      if r.err then
        return nil, r.err
      end
    end
    return nil
  end

  -- Hover on a node: the solved temperature arrives.
  local l, c = find('node junction', 'junction')
  local hover = request('textDocument/hover', l, c)
  local text = hover and hover.contents and hover.contents.value or ''
  report(text:find('Temperature **', 1, true) ~= nil and text:find('°C', 1, true) ~= nil, 'hover on a node shows its temperature', text)

  -- Hover on a quantity on the line after `°C` (UTF-16 positions from a real client).
  l, c = find('limit touch_safe', '60 °C')
  hover = request('textDocument/hover', l, c + 1)
  text = hover and hover.contents and hover.contents.value or ''
  report(text:find('333.15 K', 1, true) ~= nil, 'hover on `60 °C` gives 333.15 K', text)

  l, c = find('link board_bulk', 'fr4')
  local def = request('textDocument/definition', l, c)
  local target = def and (def.range or (def[1] and def[1].range))
  report(target and target.start.line == 8, 'definition of a material', vim.inspect(def))

  local refs = request('textDocument/references', l, c, { context = { includeDeclaration = true } })
  report(refs and #refs == 2, 'references of a material', vim.inspect(refs))

  l, c = find('node heatsink', 'heatsink')
  local edit = request('textDocument/rename', l, c, { newName = 'sink' })
  local n = 0
  for _, edits in pairs(edit and edit.changes or {}) do
    n = n + #edits
  end
  report(n == 5, 'rename a node edits its declaration and 4 uses', vim.inspect(edit))

  local symbols = request('textDocument/documentSymbol', 0, 0)
  report(symbols and #symbols >= 15, 'document symbols', symbols and #symbols)

  local hints = request('textDocument/inlayHint', 0, 0, { range = { start = { line = 0, character = 0 }, ['end'] = { line = 99, character = 0 } } })
  report(hints and #hints == 12, 'inlay hints for nodes, links and limits', hints and #hints)

  -- On attach the plugin sets the usual buffer-local maps.
  local k = vim.fn.maparg('K', 'n', false, true)
  local gd = vim.fn.maparg('gd', 'n', false, true)
  report(k.buffer == 1 and k.desc == 'caloris: hover' and gd.desc == 'caloris: definition', 'buffer-local maps for hover and definition', vim.inspect({ k.desc, gd.desc }))

  -- Where Neovim has no inlay hints (0.7-0.9), the solved values appear as end-of-line text.
  if vim.lsp.inlay_hint == nil then
    local shown = {}
    local got_hints = vim.wait(20000, function()
      shown = require('caloris').shown_hints(buf)
      return #shown >= 10
    end, 50)
    local jl = find('node junction', 'junction')
    local on_junction = ''
    for _, h in ipairs(shown) do
      if h[1] == jl then
        on_junction = h[2]
      end
    end
    report(got_hints and on_junction:find('°C', 1, true) ~= nil, 'inlay hints shown as end-of-line text (the junction temperature)', vim.inspect(shown))
  else
    report(true, 'inlay hints are native in this Neovim')
  end

  local tokens = request('textDocument/semanticTokens/full', 0, 0)
  report(tokens and tokens.data and #tokens.data > 0, 'semantic tokens')

  local ws = vim.lsp.buf_request_sync(buf, 'workspace/symbol', { query = 'alum' }, 20000)
  local found = false
  for _, r in pairs(ws or {}) do
    found = found or (r.result and #r.result >= 1)
  end
  report(found, 'workspace symbols')

  -- Type an error: the client sends didChange, diagnostics arrive.
  l, c = find('link board_bulk', 'fr4')
  vim.api.nvim_buf_set_text(buf, l, c, l, c + 3, { 'fr5' })
  local diags = {}
  local got = vim.wait(20000, function()
    diags = vim.diagnostic.get(buf)
    return #diags > 0
  end, 50)
  report(got, 'diagnostics arrive after an edit', vim.inspect(diags))
  if got then
    local d = diags[1]
    report(d.message:find('unknown material `fr5`', 1, true) ~= nil and d.lnum == l and d.col == c, 'the diagnostic names the typo at its place', vim.inspect(d))
  end

  local actions = request('textDocument/codeAction', l, c, {
    range = { start = { line = l, character = c }, ['end'] = { line = l, character = c } },
    context = { diagnostics = {} },
  })
  report(actions and actions[1] and actions[1].title == 'Replace with `fr4`', 'a code action offers the fix', vim.inspect(actions))

  -- Completion and signature help inside a new element call.
  local last = vim.api.nvim_buf_line_count(buf)
  vim.api.nvim_buf_set_lines(buf, last, last, false, { 'link lid: heatsink to porch_air layer(' })
  local line = vim.api.nvim_buf_get_lines(buf, last, last + 1, false)[1]
  -- In normal mode the cursor cannot stand after the last character, so give the position
  -- (the line is ASCII: bytes are UTF-16 units).
  local at_end = { textDocument = { uri = vim.uri_from_bufnr(buf) }, position = { line = last, character = #line } }
  local function request_at_end(method)
    for _, r in pairs(vim.lsp.buf_request_sync(buf, method, at_end, 20000) or {}) do
      if r.result then
        return r.result
      end
    end
  end
  local items = request_at_end('textDocument/completion')
  local labels = {}
  for _, it in ipairs(items and (items.items or items) or {}) do
    labels[it.label] = true
  end
  report(labels['thickness'] and labels['aluminium'], 'completion offers arguments and materials', vim.inspect(vim.tbl_keys(labels)))
  local sig = request_at_end('textDocument/signatureHelp')
  report(sig and sig.signatures and sig.signatures[1].label == 'layer(material, k, thickness, area)', 'signature help', vim.inspect(sig))
end)

if not ok_all then
  report(false, 'check script raised an error', err)
end
finish()
