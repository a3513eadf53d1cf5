;;; loop-mode-test.el --- Tests for loop-mode  -*- lexical-binding: t; -*-

;;; Commentary:

;; Run by `go test ./editors' in batch mode.  LOOP_EXAMPLE names the example
;; file to open; LOOP_EGLOT, when set, asks for the eglot test as well.

;;; Code:

(require 'ert)
(require 'loop-mode)

(defun loop-test--face-at (text &optional n)
  "Return the face at the first character of the N-th (default 1) TEXT."
  (save-excursion
    (goto-char (point-min))
    (search-forward text nil nil (or n 1))
    (let ((f (get-text-property (match-beginning 0) 'face)))
      (if (listp f) (car f) f))))

(defmacro loop-test--with-example (&rest body)
  "Visit the example file named by LOOP_EXAMPLE, fontified, and run BODY."
  `(let ((buf (find-file-noselect (getenv "LOOP_EXAMPLE"))))
     (unwind-protect
         (with-current-buffer buf
           (font-lock-ensure)
           ,@body)
       (kill-buffer buf))))

(ert-deftest loop-mode-auto-mode ()
  (loop-test--with-example
   (should (eq major-mode 'loop-mode))
   (should (equal comment-start "# "))))

(ert-deftest loop-mode-faces ()
  (loop-test--with-example
   (dolist (probe `(("# Rack-door" 1 font-lock-comment-delimiter-face)
                    ("Rack-door" 1 font-lock-comment-face)
                    ("include" 1 font-lock-keyword-face)
                    ("\"parts/tubes.loop\"" 1 font-lock-string-face)
                    ("param" 1 font-lock-keyword-face)
                    ("lift" 1 font-lock-variable-name-face)
                    ("= 1.2" 1 ,loop--operator-face)
                    ("0.35" 1 ,loop--number-face)
                    ("loop rack" 1 font-lock-keyword-face)
                    ("rack {" 1 font-lock-type-face)
                    ("fluid" 1 ,loop--property-face)
                    ("R1233zd(E)" 1 font-lock-constant-face)
                    ("(E)" 1 font-lock-constant-face)
                    ("kg" 1 font-lock-type-face)
                    ("bar(g)" 1 font-lock-type-face)
                    ("node base" 1 font-lock-keyword-face)
                    ("base at" 1 font-lock-variable-name-face)
                    ("evaporator" 1 font-lock-keyword-face)
                    ("plate from" 1 font-lock-function-name-face)
                    ("from base" 1 font-lock-keyword-face)
                    ("use copper_10" 1 font-lock-keyword-face)
                    ("copper_10" 1 font-lock-type-face)
                    ("wall_limit" 1 ,loop--property-face)
                    ("°C" 1 font-lock-type-face)
                    ("W/K" 1 font-lock-type-face)
                    ("+ 0.3" 1 ,loop--operator-face)
                    ("two long-radius" 1 font-lock-comment-face)
                    ("hot_aisle" 1 font-lock-type-face)
                    ("nominal" 1 font-lock-keyword-face)))
     (should (equal (list (car probe) (loop-test--face-at (nth 0 probe) (nth 1 probe)))
                    (list (car probe) (nth 2 probe)))))))

(ert-deftest loop-mode-allow-comment ()
  (with-temp-buffer
    (loop-mode)
    (insert "loop l {\n  loss 2   # allow: loss-high, odd-bend\n}\n")
    (font-lock-ensure)
    (should (eq (loop-test--face-at "allow") 'font-lock-preprocessor-face))
    (should (eq (loop-test--face-at "odd-bend") 'font-lock-constant-face))
    (should (eq (loop-test--face-at "loss 2") loop--property-face))))

(ert-deftest loop-mode-no-unit-inside-names ()
  (with-temp-buffer
    (loop-mode)
    (insert "loop l {\n  length a_2b\n  node n at (0, 0, 1) m\n  pipe p from n to n { length 2 m; rise 0 m }\n}\n")
    (font-lock-ensure)
    (should-not (eq (loop-test--face-at "2b") 'font-lock-type-face))
    (should (eq (loop-test--face-at ") m" ) nil))
    (should (eq (loop-test--face-at "m\n") 'font-lock-type-face))
    (should (eq (loop-test--face-at "to n") 'font-lock-keyword-face))
    (should (eq (loop-test--face-at "rise") loop--property-face))))

(ert-deftest loop-mode-indent ()
  (with-temp-buffer
    (loop-mode)
    (insert "loop a {\n      fluid water\nnode n1 at (0, 0, 0) m\n   pipe p from n1 to n2 {\n"
            "length 1 m   # a comment with a { brace\n  label \"a } in a string\"\n        }\n"
            " pipe q from n2 to n1 { length 1 m }\n      }\ncase c {\nheat e 1 kW\n}\n")
    (indent-region (point-min) (point-max))
    (should (equal (buffer-string)
                   (concat "loop a {\n  fluid water\n  node n1 at (0, 0, 0) m\n  pipe p from n1 to n2 {\n"
                           "    length 1 m   # a comment with a { brace\n    label \"a } in a string\"\n  }\n"
                           "  pipe q from n2 to n1 { length 1 m }\n}\ncase c {\n  heat e 1 kW\n}\n")))))

(ert-deftest loop-mode-eglot ()
  "Eglot starts circa serve for a .loop buffer and flymake shows its findings."
  (unless (getenv "LOOP_EGLOT")
    (ert-skip "LOOP_EGLOT not set"))
  (require 'eglot)
  (should (assq 'loop-mode eglot-server-programs))
  (let* ((file (getenv "LOOP_EGLOT"))
         (buf (find-file-noselect file)))
    (unwind-protect
        (with-current-buffer buf
          (should (eq major-mode 'loop-mode))
          (let ((server (apply #'eglot--connect (eglot--guess-contact))))
            (should server)
            (should (eglot-current-server))
            (flymake-start)
            (with-timeout (30 (ert-fail "no flymake diagnostics from circa serve within 30 s"))
              (while (null (flymake-diagnostics))
                (accept-process-output nil 0.1)
                (flymake-start)))
            ;; The unknown field is on line 4.
            (should (seq-some (lambda (d)
                                (= 4 (line-number-at-pos (flymake-diagnostic-beg d))))
                              (flymake-diagnostics)))
            (eglot-shutdown server)))
      (kill-buffer buf))))

(provide 'loop-mode-test)
;;; loop-mode-test.el ends here
