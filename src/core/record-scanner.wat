;; The plain-record scanner of parse.ts (RecordParser.scanPlainRecords) in WebAssembly: the same
;; field bounds and the same FNV-1a hashes, found 16 bytes at a time.
;;
;; Built into src/core/record-scanner-wasm.ts by `npm run wasm` (scripts/build-wasm.ts); a test
;; builds it again and compares. wasm-record-scanner.ts drives it; parse.ts keeps the JavaScript
;; scanner, which this one must match field for field (test/core/wasm-record-scanner.test.ts).
;;
;; Memory: bounds at 0 (one i32 per entry), hashes at $hashAt, the input bytes from $inputAt on,
;; followed by at least 16 bytes that may hold anything (a 16-byte load near the end reads them;
;; what it finds there is never used). Positions are counted from the start of the caller's input:
;; byte p of it is at address $base + p, where $base may wrap around (i32 arithmetic), so that a
;; caller may copy only the part of its input from some position on.
(module
  (memory (export "memory") 1)
  (global $base (export "base") (mut i32) (i32.const 0))
  (global $hashAt (export "hashAt") (mut i32) (i32.const 0))
  ;; What `records` leaves behind, besides its answer.
  (global $outB (export "outB") (mut i32) (i32.const 0))
  (global $outStart (export "outStart") (mut i32) (i32.const 0))
  (global $outNext (export "outNext") (mut i32) (i32.const 0))
  (global $outRecords (export "outRecords") (mut i32) (i32.const 0))
  (global $outLines (export "outLines") (mut i32) (i32.const 0))
  (global $outWidth (export "outWidth") (mut i32) (i32.const 0))

  ;; FNV-1a over the bytes at [p, e), cut to 30 bits: parse.ts hashBytes. Written out again in
  ;; `records` for every field; called only for a last field that loses its CR.
  (func $fnv (param $p i32) (param $e i32) (result i32)
    (local $h i32)
    (local.set $h (i32.const 0x811c9dc5))
    (block $done
      (loop $byte
        (br_if $done (i32.ge_u (local.get $p) (local.get $e)))
        (local.set $h (i32.mul (i32.xor (local.get $h) (i32.load8_u (local.get $p))) (i32.const 0x01000193)))
        (local.set $p (i32.add (local.get $p) (i32.const 1)))
        (br $byte)))
    (i32.and (local.get $h) (i32.const 0x3fffffff)))

  ;; Reads plain records from $start on, their bounds from entry $b on, as scanPlainRecords does.
  ;; $width: the width of the block's records so far (0: none yet). $room: entries the bounds and
  ;; hashes have. $full: stop after the record that takes the block to this many entries. $lf: the
  ;; line break is LF (then a CR before it is not part of the last field).
  ;; Answers why it stopped (outStart: where the next record starts, outB: the next free entry):
  ;;   0  the input or the limit reached
  ;;   1  the record at outStart has a field that starts with a quote
  ;;   2  the record at outStart does not end in the input, and more input may come ($final 0)
  ;;   3  an empty line at outStart; the next record starts at outNext
  ;;   4  the record at outStart has another width than the block's (not added)
  ;;   5  the block is full
  ;;   6  the record at outStart has more fields than the room left (not added)
  (func (export "records")
    (param $start i32) (param $n i32) (param $limit i32) (param $final i32)
    (param $b i32) (param $width i32) (param $room i32) (param $full i32)
    (param $delim i32) (param $lb i32) (param $lf i32)
    (result i32)
    (local $base i32) (local $hashes i32) (local $vd v128) (local $vl v128)
    (local $i i32) (local $count i32) (local $fieldStart i32) (local $end i32) (local $slot i32)
    (local $fieldsEnd i32) (local $next i32) (local $records i32) (local $lines i32) (local $reason i32)
    (local $p i32) (local $e i32) (local $v v128) (local $mask i32) (local $h i32) (local $r i32)
    (local.set $base (global.get $base))
    (local.set $hashes (global.get $hashAt))
    (local.set $vd (i8x16.splat (local.get $delim)))
    (local.set $vl (i8x16.splat (local.get $lb)))
    (block $out
      (loop $record
        (local.set $reason (i32.const 0))
        (br_if $out (i32.ge_u (local.get $start) (local.get $n)))
        (br_if $out (i32.ge_u (local.get $start) (local.get $limit)))
        (local.set $i (local.get $start))
        (local.set $count (i32.const 0))
        (local.set $fieldStart (local.get $start))
        (block $fieldsDone
          (loop $field
            (if (i32.lt_u (local.get $i) (local.get $n))
              (then
                (if (i32.eq (i32.load8_u (i32.add (local.get $base) (local.get $i))) (i32.const 0x22))
                  (then
                    (local.set $reason (i32.const 1))
                    (br $out)))))
            (if (i32.ge_u (i32.add (i32.add (local.get $b) (local.get $count)) (i32.const 2)) (local.get $room))
              (then
                (local.set $reason (i32.const 6))
                (br $out)))
            ;; The field's end: the first delimiter or line break, 16 bytes at a time (written out
            ;; here rather than called, as the hash below: a call per field cost ~10 % of the scan).
            ;; A load near the end reads past it into the slack; what it finds there is cut off.
            (local.set $p (i32.add (local.get $base) (local.get $i)))
            (local.set $e (i32.add (local.get $base) (local.get $n)))
            (block $found
              (loop $sixteen
                (local.set $v (v128.load (local.get $p)))
                (local.set $mask (i8x16.bitmask (v128.or (i8x16.eq (local.get $v) (local.get $vd)) (i8x16.eq (local.get $v) (local.get $vl)))))
                (br_if $found (local.get $mask))
                (local.set $p (i32.add (local.get $p) (i32.const 16)))
                (br_if $sixteen (i32.lt_u (local.get $p) (local.get $e))))
              (local.set $mask (i32.const 0))
              (local.set $p (local.get $e)))
            (local.set $p (i32.add (local.get $p) (i32.ctz (local.get $mask))))
            (local.set $p (select (local.get $e) (local.get $p) (i32.gt_u (local.get $p) (local.get $e))))
            (local.set $end (i32.sub (local.get $p) (local.get $base)))
            (local.set $slot (i32.shl (i32.add (local.get $b) (local.get $count)) (i32.const 2)))
            (i32.store (local.get $slot) (local.get $fieldStart))
            ;; The field's FNV-1a hash ($fnv), four bytes a step, then the last zero to three
            ;; bytes each kept or not by a select: fewer branches to guess than one per byte.
            (local.set $h (i32.const 0x811c9dc5))
            (local.set $p (i32.add (local.get $base) (local.get $fieldStart)))
            (local.set $e (i32.add (local.get $base) (local.get $end)))
            (block $tail
              (loop $four
                (br_if $tail (i32.lt_s (i32.sub (local.get $e) (local.get $p)) (i32.const 4)))
                (local.set $h (i32.mul (i32.xor (local.get $h) (i32.load8_u offset=0 (local.get $p))) (i32.const 0x01000193)))
                (local.set $h (i32.mul (i32.xor (local.get $h) (i32.load8_u offset=1 (local.get $p))) (i32.const 0x01000193)))
                (local.set $h (i32.mul (i32.xor (local.get $h) (i32.load8_u offset=2 (local.get $p))) (i32.const 0x01000193)))
                (local.set $h (i32.mul (i32.xor (local.get $h) (i32.load8_u offset=3 (local.get $p))) (i32.const 0x01000193)))
                (local.set $p (i32.add (local.get $p) (i32.const 4)))
                (br $four)))
            (local.set $r (i32.sub (local.get $e) (local.get $p)))
            (local.set $h (select (i32.mul (i32.xor (local.get $h) (i32.load8_u offset=0 (local.get $p))) (i32.const 0x01000193)) (local.get $h) (i32.gt_s (local.get $r) (i32.const 0))))
            (local.set $h (select (i32.mul (i32.xor (local.get $h) (i32.load8_u offset=1 (local.get $p))) (i32.const 0x01000193)) (local.get $h) (i32.gt_s (local.get $r) (i32.const 1))))
            (local.set $h (select (i32.mul (i32.xor (local.get $h) (i32.load8_u offset=2 (local.get $p))) (i32.const 0x01000193)) (local.get $h) (i32.gt_s (local.get $r) (i32.const 2))))
            (i32.store (i32.add (local.get $hashes) (local.get $slot)) (i32.and (local.get $h) (i32.const 0x3fffffff)))
            (local.set $count (i32.add (local.get $count) (i32.const 1)))
            (local.set $i (local.get $end))
            (br_if $fieldsDone (i32.eq (local.get $i) (local.get $n)))
            (br_if $fieldsDone (i32.ne (i32.load8_u (i32.add (local.get $base) (local.get $i))) (local.get $delim)))
            (local.set $i (i32.add (local.get $i) (i32.const 1)))
            (local.set $fieldStart (local.get $i))
            (br $field)))
        (if (i32.and (i32.eq (local.get $i) (local.get $n)) (i32.eqz (local.get $final)))
          (then
            (local.set $reason (i32.const 2))
            (br $out)))
        (local.set $fieldsEnd (local.get $i))
        (if (i32.and (local.get $lf) (i32.and (i32.lt_u (local.get $i) (local.get $n)) (i32.gt_u (local.get $i) (local.get $fieldStart))))
          (then
            (if (i32.eq (i32.load8_u (i32.sub (i32.add (local.get $base) (local.get $i)) (i32.const 1))) (i32.const 0x0d))
              (then
                (local.set $fieldsEnd (i32.sub (local.get $i) (i32.const 1)))
                (i32.store
                  (i32.add (local.get $hashes) (i32.shl (i32.sub (i32.add (local.get $b) (local.get $count)) (i32.const 1)) (i32.const 2)))
                  (call $fnv (i32.add (local.get $base) (local.get $fieldStart)) (i32.add (local.get $base) (local.get $fieldsEnd))))))))
        (local.set $next (select (i32.add (local.get $i) (i32.const 1)) (local.get $n) (i32.lt_u (local.get $i) (local.get $n))))
        (if (i32.eq (local.get $fieldsEnd) (local.get $start))
          (then
            (local.set $reason (i32.const 3))
            (br $out)))
        (if (i32.and (i32.ne (local.get $width) (i32.const 0)) (i32.ne (local.get $count) (local.get $width)))
          (then
            (local.set $reason (i32.const 4))
            (br $out)))
        (i32.store (i32.shl (i32.add (local.get $b) (local.get $count)) (i32.const 2)) (i32.add (local.get $fieldsEnd) (i32.const 1)))
        (local.set $width (local.get $count))
        (local.set $records (i32.add (local.get $records) (i32.const 1)))
        (local.set $lines (i32.add (local.get $lines) (i32.gt_u (local.get $next) (local.get $i))))
        (local.set $b (i32.add (local.get $b) (i32.add (local.get $count) (i32.const 1))))
        (local.set $start (local.get $next))
        (local.set $reason (i32.const 5))
        (br_if $out (i32.ge_u (local.get $b) (local.get $full)))
        (br $record)))
    (global.set $outB (local.get $b))
    (global.set $outStart (local.get $start))
    (global.set $outNext (local.get $next))
    (global.set $outRecords (local.get $records))
    (global.set $outLines (local.get $lines))
    (global.set $outWidth (local.get $width))
    (local.get $reason))
)
