;;; loop-mode.el --- Major mode for circa .loop files  -*- lexical-binding: t; -*-

;; Version: 0.1.0
;; Package-Requires: ((emacs "26.1"))
;; Keywords: languages

;;; Commentary:

;; Editing `.loop' files, which describe passive two-phase cooling loops for
;; the circa checker: highlighting with the standard font-lock faces (so
;; colours come from the theme), `#' comments, indentation by braces, and
;; registration of `circa serve' with eglot.
;;
;;   (require 'loop-mode)
;;   (add-hook 'loop-mode-hook #'eglot-ensure)   ; optional: start circa serve

;;; Code:

(defgroup loop nil
  "Editing circa .loop files."
  :group 'languages
  :prefix "loop-")

(defcustom loop-indent-offset 2
  "Columns of indentation per open brace in `loop-mode'."
  :type 'integer
  :safe #'integerp)

(defcustom loop-circa-program '("circa" "serve")
  "Command that runs the circa language server, for eglot."
  :type '(repeat string))

;; Faces: Emacs 29 has number, operator and property-name faces; earlier
;; versions fall back to the nearest standard face.
(defvar loop--number-face
  (if (facep 'font-lock-number-face) 'font-lock-number-face 'font-lock-constant-face))
(defvar loop--operator-face
  (if (facep 'font-lock-operator-face) 'font-lock-operator-face 'font-lock-builtin-face))
(defvar loop--property-face
  (if (facep 'font-lock-property-name-face) 'font-lock-property-name-face 'font-lock-builtin-face))

(defvar loop-mode-syntax-table
  (let ((st (make-syntax-table)))
    (modify-syntax-entry ?# "<" st)
    (modify-syntax-entry ?\n ">" st)
    (modify-syntax-entry ?\" "\"" st)
    (modify-syntax-entry ?\\ "\\" st)
    (modify-syntax-entry ?_ "_" st)
    (modify-syntax-entry ?{ "(}" st)
    (modify-syntax-entry ?} "){" st)
    (modify-syntax-entry ?\( "()" st)
    (modify-syntax-entry ?\) ")(" st)
    (dolist (c '(?+ ?- ?* ?/ ?^ ?= ?, ?\; ?% ?°))
      (modify-syntax-entry c "." st))
    st)
  "Syntax table for `loop-mode'.")

(defconst loop--name "[[:alpha:]_][[:alnum:]_]*")

(defconst loop--stmt-start "\\(?:^\\|[{;]\\)[ \t]*"
  "Where a statement may start: a line's beginning, or after `{' or `;'.")

(defconst loop--unit
  (concat "\\(?:[[:alpha:]_%°µμ]\\(?:[^][[:space:]#,;{}=\"()]\\|([^()#\n]*)\\)*\\)")
  "A unit word: it runs to the first blank outside parentheses.")

(defconst loop--not-unit "\\(?:\\(?:from\\|to\\|at\\|nominal\\)\\_>\\)"
  "Keywords that may follow a quantity and are not units.")

(defvar loop-font-lock-keywords
  `(;; "# allow: RULE, RULE" silences findings on its line.
    ("#[ \t]*\\(allow\\)[ \t]*:[ \t]*\\([-[:alnum:]_, \t]*\\)"
     (1 font-lock-preprocessor-face t) (2 font-lock-constant-face t))
    ;; Declarations and their names.
    (,(concat loop--stmt-start "\\_<\\(include\\|limits\\|methods\\)\\_>")
     1 font-lock-keyword-face)
    (,(concat loop--stmt-start "\\_<\\(param\\)\\_>\\(?:[ \t]+\\(" loop--name "\\)\\)?")
     (1 font-lock-keyword-face) (2 font-lock-variable-name-face nil t))
    (,(concat loop--stmt-start "\\_<\\(loop\\|part\\|case\\)\\_>\\(?:[ \t]+\\(" loop--name "\\)\\)?")
     (1 font-lock-keyword-face) (2 font-lock-type-face nil t))
    (,(concat loop--stmt-start "\\_<\\(node\\|junction\\)\\_>\\(?:[ \t]+\\(" loop--name "\\)\\)?")
     (1 font-lock-keyword-face) (2 font-lock-variable-name-face nil t))
    (,(concat loop--stmt-start
              "\\_<\\(pipe\\|evaporator\\|condenser\\|bend\\|fitting\\|reservoir\\)\\_>\\(?:[ \t]+\\("
              loop--name "\\)\\)?")
     (1 font-lock-keyword-face) (2 font-lock-function-name-face nil t))
    (,(concat loop--stmt-start "\\_<\\(use\\)\\_>\\(?:[ \t]+\\(" loop--name "\\)\\)?")
     (1 font-lock-keyword-face) (2 font-lock-type-face nil t))
    ;; fluid NAME (with an optional stereo-isomer suffix) or fluid table "FILE".
    (,(concat loop--stmt-start "\\_<\\(fluid\\)[ \t]+\\(table\\)\\_>")
     (1 loop--property-face) (2 font-lock-keyword-face))
    (,(concat loop--stmt-start "\\_<\\(fluid\\)\\_>\\(?:[ \t]+\\(" loop--name "\\(?:([A-Z])\\)?\\)\\)?")
     (1 loop--property-face) (2 font-lock-constant-face nil t))
    (,(concat loop--stmt-start
              "\\_<\\(void_fraction\\|friction\\|single_phase\\|chf\\)\\_>\\(?:[ \t]+\\(" loop--name "\\)\\)?")
     (1 loop--property-face) (2 font-lock-constant-face nil t))
    ;; Any other first word of a statement is a field.
    (,(concat loop--stmt-start "\\(" loop--name "\\)") 1 loop--property-face)
    ;; Connections and modifiers.
    ("\\_<\\(from\\|to\\|at\\)\\_>" 1 font-lock-keyword-face)
    ("\\_<nominal\\_>" . font-lock-keyword-face)
    ;; Numbers with their unit, and the unit after a vector.
    (,(concat "\\(?:^\\|[^[:alnum:]_.]\\)"
              "\\([0-9]+\\(?:\\.[0-9]*\\)?\\(?:[eE][-+]?[0-9]+\\)?\\|\\.[0-9]+\\(?:[eE][-+]?[0-9]+\\)?\\)"
              "\\(?:[ \t]*\\(" loop--unit "\\)\\)?")
     (1 loop--number-face)
     (2 (unless (save-excursion (goto-char (match-beginning 2)) (looking-at loop--not-unit))
          'font-lock-type-face)
        nil t))
    (,(concat ")[ \t]*\\(" loop--unit "\\)")
     (1 (unless (save-excursion (goto-char (match-beginning 1)) (looking-at loop--not-unit))
          'font-lock-type-face)))
    ("[-+*/^=]" . loop--operator-face))
  "Font-lock rules for `loop-mode'.")

(defun loop-indent-line ()
  "Indent the current line by the braces and parentheses open before it."
  (interactive)
  (let* ((depth (save-excursion (car (syntax-ppss (line-beginning-position)))))
         (closes (save-excursion
                   (back-to-indentation)
                   (looking-at-p "[})]")))
         (col (* loop-indent-offset (max 0 (- depth (if closes 1 0)))))
         (offset (- (current-column) (current-indentation))))
    (indent-line-to col)
    (when (> offset 0)
      (forward-char offset))))

;;;###autoload
(define-derived-mode loop-mode prog-mode "Loop"
  "Major mode for circa .loop files.

\\{loop-mode-map}"
  :syntax-table loop-mode-syntax-table
  (setq-local comment-start "# ")
  (setq-local comment-start-skip "#+[ \t]*")
  (setq-local comment-end "")
  (setq-local indent-line-function #'loop-indent-line)
  (setq-local indent-tabs-mode nil)
  (setq-local electric-indent-chars (append '(?\} ?\)) electric-indent-chars))
  (setq-local font-lock-defaults '(loop-font-lock-keywords)))

;;;###autoload
(add-to-list 'auto-mode-alist '("\\.loop\\'" . loop-mode))

;; The circa language server, for eglot (M-x eglot, or eglot-ensure in
;; `loop-mode-hook').
(with-eval-after-load 'eglot
  (defvar eglot-server-programs)
  (add-to-list 'eglot-server-programs `(loop-mode . ,loop-circa-program)))

(provide 'loop-mode)
;;; loop-mode.el ends here
