;; The row loop of csv-write.ts (BufferedCsvWriter.writeRows) in WebAssembly: a row of the output
;; is its pieces one after the other, each copied 16 bytes at a time.
;;
;; Built into src/core/row-copier-wasm.ts by `npm run wasm` (scripts/build-wasm.ts); a test builds
;; it again and compares. wasm-row-copier.ts lays out the memory and drives it; csv-write.ts keeps
;; the loop in JavaScript, which this one must match byte for byte (test/core/wasm-row-copier.test.ts).
;;
;; A copy may run up to 15 bytes past a piece's end, both where it reads and where it writes: the
;; caller leaves 16 bytes of room after the pieces' bytes and after the output. What lands past a
;; piece's end in the output is overwritten by the next piece, or lies past the output's end.
(module
  (memory (export "memory") 1)
  ;; Where the output stopped: the next free byte.
  (global $outPos (export "outPos") (mut i32) (i32.const 0))

  ;; Copies rows [$row, $rows), skipping those whose byte at $rejectedAt + row is 1, into the output
  ;; at $outAt from $pos on. Row r's pieces are the i32s at $pieceOfAt + 4 (r × $n … r × $n + $n − 1);
  ;; piece p is bytes [$bytesAt + start, $bytesAt + end) with start and end the i32s at
  ;; $boundsAt + 8p and $boundsAt + 8p + 4. Stops before a row when the output has passed $limit;
  ;; answers the first row not copied ($rows when all were), the output's end in outPos.
  (func (export "copyRows")
    (param $pieceOfAt i32) (param $n i32) (param $rejectedAt i32) (param $row i32) (param $rows i32)
    (param $boundsAt i32) (param $bytesAt i32) (param $outAt i32) (param $pos i32) (param $limit i32)
    (result i32)
    (local $i i32) (local $end i32) (local $bound i32) (local $from i32) (local $to i32)
    (local $length i32) (local $k i32)
    (local.set $i (i32.mul (local.get $row) (local.get $n)))
    (block $done
      (loop $rowLoop
        (br_if $done (i32.ge_u (local.get $row) (local.get $rows)))
        (if (i32.load8_u (i32.add (local.get $rejectedAt) (local.get $row)))
          (then
            (local.set $i (i32.add (local.get $i) (local.get $n)))
            (local.set $row (i32.add (local.get $row) (i32.const 1)))
            (br $rowLoop)))
        (br_if $done (i32.gt_s (local.get $pos) (local.get $limit)))
        (local.set $end (i32.add (local.get $i) (local.get $n)))
        (block $rowDone
          (loop $pieceLoop
            (br_if $rowDone (i32.ge_u (local.get $i) (local.get $end)))
            (local.set $bound
              (i32.add (local.get $boundsAt) (i32.shl (i32.load (i32.add (local.get $pieceOfAt) (i32.shl (local.get $i) (i32.const 2)))) (i32.const 3))))
            (local.set $from (i32.add (local.get $bytesAt) (i32.load (local.get $bound))))
            (local.set $length (i32.sub (i32.load offset=4 (local.get $bound)) (i32.load (local.get $bound))))
            (local.set $to (i32.add (local.get $outAt) (local.get $pos)))
            (local.set $k (i32.const 0))
            (loop $sixteen
              (v128.store (i32.add (local.get $to) (local.get $k)) (v128.load (i32.add (local.get $from) (local.get $k))))
              (local.set $k (i32.add (local.get $k) (i32.const 16)))
              (br_if $sixteen (i32.lt_s (local.get $k) (local.get $length))))
            (local.set $pos (i32.add (local.get $pos) (local.get $length)))
            (local.set $i (i32.add (local.get $i) (i32.const 1)))
            (br $pieceLoop)))
        (local.set $row (i32.add (local.get $row) (i32.const 1)))
        (br $rowLoop)))
    (global.set $outPos (local.get $pos))
    (local.get $row))
)
