" Vim syntax file
" Language:    Caloris thermal network models (*.heat)
" Maintainer:  the Caloris developers

if exists('b:current_syntax')
  finish
endif

let s:cpo_save = &cpo
set cpo&vim

syn case match

" Comments and strings
syn keyword heatTodo      contained TODO FIXME XXX NOTE
syn match   heatComment   /#.*$/ contains=heatTodo,@Spell
syn region  heatString    start=/"/ skip=/\\./ end=/"/ end=/$/ oneline contains=heatEscape
syn match   heatEscape    contained /\\./

" Keywords; the name after a declaration keyword is the declared name
syn keyword heatInclude   import
syn keyword heatKeyword   title to
syn keyword heatKeyword   param node link limit nextgroup=heatDefName skipwhite
syn keyword heatKeyword   material buildup nextgroup=heatTypeName skipwhite
" Contextual words: declarations only at the start of a line before a name (a node may be
" called `case`)
syn match   heatKeyword   /^\s*\zs\%(schedule\|case\|transient\|repeat\|network\|use\|region\)\ze\s\+\h\w*\s*\%([(:{]\|$\)/ nextgroup=heatDefName skipwhite
" A digit segment of a generated name (fin.3.t, plate.2.1) is part of the name, not a number
syn match   heatNameDigits /\%(\w\.\)\@<=\d\+\>/
syn match   heatDefName   contained /\<\h\w*\>/
syn match   heatTypeName  contained /\<\h\w*\>/

" Element label inside a build-up:  inside: film(...)
syn match   heatElement   /^\s*\zs\h\w*\ze\s*:/

" Built-in functions, measures and element kinds (only before a parenthesis)
syn match   heatFunction  /\<\%(sqrt\|ln\|exp\|abs\|min\|max\)\ze\s*(/
syn match   heatFunction  /\<\%(temperature\|heat_flow\|heat_flux\|u_value\|r_value\)\ze\s*(/
syn match   heatFunction  /\<\%(layer\|film\|contact\|resistance\|conductance\|cylinder\|sphere\|radiation\|buried_pipe\|buried_sphere\|parallel_cylinders\|fin\|heated_slab\|heated_rod\|natural_wall\|natural_cylinder\|natural_plate\|natural_sphere\|crossflow_cylinder\|plate_flow\|pipe_flow\)\ze\s*(/
syn keyword heatConstant  pi

" Quantities: a number, then (directly or after one space) a unit with no spaces,
" e.g. 12.5 mm, 0.04 W/(m*K), 20 °C, 9 mm^2, 3 m², 1e-3 s^-1, 4 h*ft^2*°F/Btu.
syn match   heatNumber    /\%(\w\|\.\)\@<!\%(\d\+\%(\.\d*\)\=\|\.\d\+\)\%([eE][+-]\=\d\+\)\=/ nextgroup=heatUnit skipwhite
syn match   heatUnit      contained /\%([A-Za-z_°Δµμ][A-Za-z_°]*\|(\%([A-Za-z_°Δµμ][A-Za-z_°]*\%(\^-\=\d\+\|⁻\=[⁰¹²³⁴⁵⁶⁷⁸⁹]\+\)\=[*·/]\=\)\+)\)\%(\^-\=\d\+\|⁻\=[⁰¹²³⁴⁵⁶⁷⁸⁹]\+\)\=\%([*·/]\%([A-Za-z_°Δµμ][A-Za-z_°]*\|(\%([A-Za-z_°Δµμ][A-Za-z_°]*\%(\^-\=\d\+\|⁻\=[⁰¹²³⁴⁵⁶⁷⁸⁹]\+\)\=[*·/]\=\)\+)\)\%(\^-\=\d\+\|⁻\=[⁰¹²³⁴⁵⁶⁷⁸⁹]\+\)\=\)*/

" Operators and punctuation
syn match   heatOperator  /<=\|>=\|[<>=+\-*/^·]/
syn match   heatDelimiter /[:,]/

hi def link heatComment   Comment
hi def link heatTodo      Todo
hi def link heatString    String
hi def link heatEscape    SpecialChar
hi def link heatInclude   Include
hi def link heatKeyword   Keyword
hi def link heatNameDigits Identifier
hi def link heatDefName   Identifier
hi def link heatTypeName  Type
hi def link heatElement   Label
hi def link heatFunction  Function
hi def link heatConstant  Constant
hi def link heatNumber    Number
hi def link heatUnit      Type
hi def link heatOperator  Operator
hi def link heatDelimiter Delimiter

let b:current_syntax = 'heat'

let &cpo = s:cpo_save
unlet s:cpo_save
