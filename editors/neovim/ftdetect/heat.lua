-- Caloris models: *.heat -> filetype "heat".
-- Works with both filetype.vim (Neovim 0.7) and filetype.lua (0.8+).
if vim.filetype and vim.filetype.add then
  vim.filetype.add({ extension = { heat = 'heat' } })
end
vim.cmd([[
  augroup caloris_ftdetect
    autocmd!
    autocmd BufRead,BufNewFile *.heat setfiletype heat
  augroup END
]])
