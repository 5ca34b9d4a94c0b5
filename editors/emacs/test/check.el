;;; check.el --- batch checks for caloris-mode  -*- lexical-binding: t; -*-
;; Run from the repository root:
;;   emacs --batch -l editors/emacs/test/check.el
;; Prints "ok - ..." / "not ok - ..." lines and exits non-zero on failure.

(require 'cl-lib)
(require 'bytecomp)

(defvar check-dir (file-name-directory (or load-file-name buffer-file-name)))
(defvar check-emacs-dir (expand-file-name ".." check-dir))
(defvar check-editors-dir (expand-file-name "../.." check-dir))
(defvar check-passed 0)
(defvar check-failed 0)

(defun check-report (ok what &optional detail)
  (if ok
      (progn (cl-incf check-passed) (princ (format "ok - %s\n" what)))
    (cl-incf check-failed)
    (princ (format "not ok - %s%s\n" what (if detail (format ": %S" detail) "")))))

(defmacro check-safely (what &rest body)
  `(condition-case err (progn ,@body)
     (error (check-report nil ,what err))))

(princ (format "GNU Emacs %s\n" emacs-version))

;; 1. Byte-compiles without warnings (into a temporary directory).
(check-safely "byte-compile"
  (let* ((src (expand-file-name "caloris-mode.el" check-emacs-dir))
         (tmp (make-temp-file "caloris-elc" t))
         (copy (expand-file-name "caloris-mode.el" tmp))
         (byte-compile-error-on-warn t)
         (log-buffer (get-buffer-create byte-compile-log-buffer)))
    (copy-file src copy t)
    (with-current-buffer log-buffer (let ((inhibit-read-only t)) (erase-buffer)))
    (let ((ok (byte-compile-file copy)))
      (check-report (and ok (file-exists-p (concat copy "c")))
                    "byte-compiles with byte-compile-error-on-warn"
                    (with-current-buffer log-buffer (buffer-string))))
    (delete-directory tmp t)))

;; 2. Loads and is chosen for .heat files.
(load (expand-file-name "caloris-mode.el" check-emacs-dir) nil t)
(check-report (featurep 'caloris-mode) "caloris-mode.el loads")
(check-report (eq (cdr (assoc "\\.heat\\'" auto-mode-alist)) 'caloris-mode)
              "auto-mode-alist maps .heat to caloris-mode")

(defun check-face-at (text &optional offset)
  "Face at the first occurrence of TEXT (plus OFFSET) in the current buffer."
  (save-excursion
    (goto-char (point-min))
    (when (search-forward text nil t)
      (let ((f (get-text-property (+ (match-beginning 0) (or offset 0)) 'face)))
        (if (listp f) (car f) f)))))

(check-safely "open sample.heat"
  (with-current-buffer (find-file-noselect (expand-file-name "sample.heat" check-editors-dir))
    (check-report (eq major-mode 'caloris-mode) "sample.heat opens in caloris-mode" major-mode)
    (check-report (equal comment-start "# ") "comment-start is \"# \"" comment-start)
    (font-lock-ensure)
    (dolist (c '(("LED downlight on" font-lock-comment-face)
                 ("# LED" font-lock-comment-delimiter-face)
                 ("title" font-lock-keyword-face)
                 ("LED downlight\"" font-lock-string-face)
                 ("param" font-lock-keyword-face)
                 ("sink_area" font-lock-variable-name-face)
                 ("0.021" font-lock-constant-face)
                 ("m^2" font-lock-type-face)
                 ("aluminium" font-lock-type-face)
                 ("W/(m*K)" font-lock-type-face)
                 ("°C" font-lock-type-face)
                 ("junction to" font-lock-keyword-face 9)
                 ("contact(" font-lock-builtin-face)
                 ("temperature(" font-lock-builtin-face)))
      (let ((face (check-face-at (car c) (nth 2 c))))
        (check-report (eq face (cadr c))
                      (format "%-18s -> %s" (car c) (cadr c)) face)))
    (kill-buffer)))

;; 3. Indentation inside a build-up.
(check-safely "indent"
  (with-temp-buffer
    (caloris-mode)
    (insert "buildup wall {\ninside: film(r = 0.13 m^2*K/W)\n}\n")
    (indent-region (point-min) (point-max))
    (check-report (equal (buffer-string) "buildup wall {\n  inside: film(r = 0.13 m^2*K/W)\n}\n")
                  "build-up elements indent by 2" (buffer-string))))

;; 4. Eglot registration, and a session against a stand-in server.
(check-safely "eglot"
  (require 'eglot)
  (check-report (equal (cdr (assq 'caloris-mode eglot-server-programs)) '("caloris" "lsp"))
                "eglot-server-programs has (caloris-mode \"caloris\" \"lsp\")"
                (assq 'caloris-mode eglot-server-programs))
  (if (not (fboundp 'eglot--connect))
      (princ "skip - eglot session (eglot--connect not found in this Eglot)\n")
    (let* ((tmp (file-name-as-directory (make-temp-file "caloris-eglot" t)))
           (log (expand-file-name "lsp.log" tmp))
           (file (expand-file-name "a.heat" tmp))
           (process-environment (cons (concat "FAKE_LSP_LOG=" log) process-environment))
           (caloris-server-command
            (list "node" (expand-file-name "test/fake-lsp.js" check-editors-dir))))
      (caloris-register-eglot)
      (copy-file (expand-file-name "sample.heat" check-editors-dir) file)
      (with-current-buffer (find-file-noselect file)
        (let ((inhibit-message t))
          (apply #'eglot--connect (eglot--guess-contact)))
        (let ((server (eglot-current-server)))
          (check-report server "eglot connects to the server command for a .heat buffer")
          (let ((deadline (+ (float-time) 10)))
            (while (and (< (float-time) deadline)
                        (not (and (file-exists-p log)
                                  (with-temp-buffer
                                    (insert-file-contents log)
                                    (search-forward "textDocument/didOpen" nil t)))))
              (accept-process-output nil 0.05)))
          (let ((methods (and (file-exists-p log)
                              (with-temp-buffer (insert-file-contents log)
                                                (split-string (buffer-string) "\n" t)))))
            (check-report (and (member "initialize" methods) (member "initialized" methods)
                               (member "textDocument/didOpen" methods))
                          "server got initialize, initialized, didOpen" methods))
          (when server
            (let ((inhibit-message t)) (ignore-errors (eglot-shutdown server)))))
        (set-buffer-modified-p nil)
        (kill-buffer))
      (delete-directory tmp t))))

(princ (format "emacs: %d passed, %d failed\n" check-passed check-failed))
(kill-emacs (if (zerop check-failed) 0 1))
