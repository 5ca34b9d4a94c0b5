;;; caloris-mode.el --- Major mode for Caloris thermal network models  -*- lexical-binding: t; -*-

;; Copyright (c) 2026 the Caloris developers
;; SPDX-License-Identifier: MIT

;; Author: the Caloris developers
;; Version: 0.1.0
;; Package-Requires: ((emacs "26.1"))
;; Keywords: languages

;;; Commentary:

;; Editing support for Caloris models (files ending in .heat):
;;
;; - syntax highlighting: keywords, the names declared after `param',
;;   `material', `node', `link', `buildup' and `limit', numbers with their
;;   units (12.5 mm, 0.04 W/(m*K), 20 °C), strings, built-in functions,
;;   build-up element labels and `#' comments;
;; - `#' line comments for M-; and friends;
;; - indentation of build-up elements inside { };
;; - the language server `caloris lsp' is registered with Eglot: run
;;   M-x eglot in a .heat buffer, or add `eglot-ensure' to
;;   `caloris-mode-hook'.
;;
;; Install: put this file on `load-path' and (require 'caloris-mode).

;;; Code:

(defgroup caloris nil
  "Editing Caloris thermal network models."
  :group 'languages
  :prefix "caloris-")

(defcustom caloris-indent-offset 2
  "Indentation of the elements inside a build-up block."
  :type 'integer
  :safe #'integerp
  :group 'caloris)

(defcustom caloris-server-command '("caloris" "lsp")
  "Command, with arguments, that starts the Caloris language server.
Read when Eglot loads; after changing it, evaluate
`caloris-register-eglot' again."
  :type '(repeat string)
  :group 'caloris)

(defconst caloris-keywords
  '("title" "import" "param" "material" "node" "link" "buildup" "limit" "to")
  "Keywords of the Caloris language.")

;; The word lists below are checked against the compiler's schema by
;; tests/editor_grammars.rs: every word of the language, and no other.
(defconst caloris-functions
  '("sqrt" "ln" "exp" "abs" "min" "max")
  "Functions of Caloris expressions.")

(defconst caloris-measures
  '("temperature" "heat_flow" "heat_flux" "u_value" "r_value")
  "What a Caloris limit may measure.")

(defconst caloris-element-kinds
  '("layer" "film" "contact" "resistance" "conductance"
    "cylinder" "sphere" "radiation" "buried_pipe" "buried_sphere"
    "parallel_cylinders" "fin" "heated_slab" "heated_rod"
    "natural_wall" "natural_cylinder" "natural_plate" "natural_sphere" "crossflow_cylinder" "plate_flow" "pipe_flow")
  "Element kinds of Caloris links.")

(defconst caloris-builtin-functions
  (append caloris-functions caloris-measures caloris-element-kinds)
  "Functions, measures and element kinds that Caloris provides.")

(defconst caloris--name-re "[[:alpha:]_][[:alnum:]_]*"
  "A Caloris name.")

(defconst caloris--unit-re
  (let* ((ident "[[:alpha:]°Δµ_][[:alpha:]_°]*")
         (pow "\\(?:\\^-?[0-9]+\\|⁻?[⁰¹²³⁴⁵⁶⁷⁸⁹]+\\)?")
         (simple (concat ident pow "\\(?:[*·/]" ident pow "\\)*"))
         (factor (concat "\\(?:" ident "\\|(" simple ")\\)" pow)))
    (concat factor "\\(?:[*·/]" factor "\\)*"))
  "A unit written without spaces: mm, W/(m^2*K), °C, h*ft^2*°F/Btu.")

(defconst caloris--number-re
  "\\(?:[0-9]+\\(?:\\.[0-9]*\\)?\\|\\.[0-9]+\\)\\(?:[eE][-+]?[0-9]+\\)?"
  "A number literal.")

(defconst caloris-font-lock-keywords
  `(;; declared names
    (,(concat "\\_<\\(param\\|node\\|link\\|limit\\)\\_>[ \t]+\\("
              caloris--name-re "\\)")
     (2 font-lock-variable-name-face))
    (,(concat "\\_<\\(material\\|buildup\\)\\_>[ \t]+\\(" caloris--name-re "\\)")
     (2 font-lock-type-face))
    ;; contextual words: a declaration only at the start of a line before a name
    (,(concat "^[ \t]*\\(schedule\\|case\\|transient\\|repeat\\|network\\|use\\|region\\)"
              "[ \t]+\\(" caloris--name-re "\\)[ \t]*\\(?:[(:{]\\|$\\)")
     (1 font-lock-keyword-face) (2 font-lock-type-face))
    ;; keywords
    (,(regexp-opt caloris-keywords 'symbols) . font-lock-keyword-face)
    ;; element label inside a build-up:  inside: film(...)
    (,(concat "^[ \t]*\\(" caloris--name-re "\\)[ \t]*:")
     (1 font-lock-constant-face))
    ;; built-in functions, measures and element kinds before "("
    (,(concat (regexp-opt caloris-builtin-functions 'symbols) "[ \t]*(")
     (1 font-lock-builtin-face))
    ;; any other NAME( is a build-up used as the kind of a link
    (,(concat "\\_<\\(" caloris--name-re "\\)[ \t]*(")
     (1 font-lock-type-face))
    ("\\_<pi\\_>" . font-lock-constant-face)
    ;; quantities: number, optional single space, unit
    (,(concat "\\(?:^\\|[^[:alnum:]_.]\\)\\(" caloris--number-re "\\)"
              "\\(?:[ \t]?\\(" caloris--unit-re "\\)\\)?")
     (1 font-lock-constant-face)
     (2 font-lock-type-face nil t)))
  "Font-lock rules for `caloris-mode'.")

(defvar caloris-mode-syntax-table
  (let ((st (make-syntax-table)))
    (modify-syntax-entry ?# "<" st)
    (modify-syntax-entry ?\n ">" st)
    (modify-syntax-entry ?\" "\"" st)
    (modify-syntax-entry ?\\ "\\" st)
    (modify-syntax-entry ?_ "_" st)
    (modify-syntax-entry ?. "." st)
    (dolist (c '(?+ ?- ?* ?/ ?^ ?< ?> ?= ?: ?, ?·))
      (modify-syntax-entry c "." st))
    (modify-syntax-entry ?\( "()" st)
    (modify-syntax-entry ?\) ")(" st)
    (modify-syntax-entry ?\{ "(}" st)
    (modify-syntax-entry ?\} "){" st)
    st)
  "Syntax table for `caloris-mode'.")

(defun caloris-indent-line ()
  "Indent the current line: build-up elements by `caloris-indent-offset'."
  (interactive)
  (let* ((depth (save-excursion
                  (beginning-of-line)
                  (let ((d (car (syntax-ppss))))
                    (skip-chars-forward " \t")
                    (if (and (> d 0) (looking-at-p "[)}]")) (1- d) d))))
         (target (* (max depth 0) caloris-indent-offset))
         (offset (- (current-column) (current-indentation))))
    (indent-line-to target)
    (when (> offset 0)
      (forward-char offset))))

;;;###autoload
(define-derived-mode caloris-mode prog-mode "Caloris"
  "Major mode for Caloris thermal network models (.heat files).

\\{caloris-mode-map}"
  :syntax-table caloris-mode-syntax-table
  :group 'caloris
  (setq-local comment-start "# ")
  (setq-local comment-end "")
  (setq-local comment-start-skip "#+[ \t]*")
  (setq-local indent-line-function #'caloris-indent-line)
  (setq-local indent-tabs-mode nil)
  (setq-local font-lock-defaults '(caloris-font-lock-keywords nil nil)))

;;;###autoload
(add-to-list 'auto-mode-alist '("\\.heat\\'" . caloris-mode))

(defvar eglot-server-programs)

;;;###autoload
(defun caloris-register-eglot ()
  "Register `caloris-server-command' for `caloris-mode' with Eglot."
  (add-to-list 'eglot-server-programs
               (cons 'caloris-mode caloris-server-command)))

;;;###autoload
(with-eval-after-load 'eglot
  (caloris-register-eglot))

(provide 'caloris-mode)

;;; caloris-mode.el ends here
