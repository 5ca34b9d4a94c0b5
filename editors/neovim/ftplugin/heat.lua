-- Buffer settings for Caloris models (*.heat).
if vim.b.did_ftplugin then
  return
end
vim.b.did_ftplugin = 1

vim.bo.commentstring = '# %s'
vim.bo.comments = ':#'
-- Keep `#` comments when wrapping (c) and continue them on <Enter>/o (r, o).
vim.bo.formatoptions = vim.bo.formatoptions:gsub('t', '') .. 'croql'
-- The documented layout indents build-up elements by two spaces.
vim.bo.expandtab = true
vim.bo.shiftwidth = 2
vim.bo.softtabstop = 2

vim.b.undo_ftplugin = 'setlocal commentstring< comments< formatoptions< expandtab< shiftwidth< softtabstop<'
