;; Hot loop of the local entropy filter in WebAssembly (see entropyKernel.ts for the method).
;;
;; interiorPair slides two histograms A (window rows y − r … y + r) and B (the same rows shifted
;; down by one) over the interior columns of one row pair, exactly as Kernel.interiorPair in
;; entropyKernel.ts does, in the same order of operations, so both give identical output.
;; All addresses are byte offsets into the exported memory, laid out by entropyWasm.ts.
;; Build: npm run build:wasm (scripts/build-wasm.mjs, wabt) → entropyWasm.generated.ts.
(module
  (memory (export "memory") 1)

  ;; $hA, $hB  histograms (i32 × nBins)
  ;; $q        address of bins[pa + x0 − r − 1]: top-left pixel of the leaving column of A
  ;; $n        number of output columns (x0 … x1)
  ;; $w        window side 2r + 1 (distance leaving → entering column)
  ;; $W        image width (row stride of bins)
  ;; $span     2r · W
  ;; $inc      table inc[c] = T[c + 1] − T[c] (f64)
  ;; $out      address of out[y · W + x0] (f32); row y + 1 is at $out + 4W
  ;; $SA, $SB  S of A and B before the first column; $tN = T[N], $iN = 1 / (N · scale)
  ;; The final S of A and B are stored at address 0 and 8.
  (func (export "interiorPair")
    (param $hA i32) (param $hB i32) (param $q i32) (param $n i32)
    (param $w i32) (param $W i32) (param $span i32) (param $inc i32) (param $out i32)
    (param $SA f64) (param $SB f64) (param $tN f64) (param $iN f64)
    (local $end i32) (local $p i32) (local $pe i32) (local $qb i32)
    (local $bo i32) (local $bi i32) (local $t i32) (local $c i32) (local $outB i32)
    (local $a0 f64) (local $a1 f64) (local $b0 f64) (local $b1 f64) (local $e f64)
    (local.set $end (i32.add (local.get $q) (local.get $n)))
    (local.set $outB (i32.add (local.get $out) (i32.shl (local.get $W) (i32.const 2))))
    (if (i32.gt_s (local.get $n) (i32.const 0))
      (then
        (loop $cols
          ;; top row: A only
          (local.set $bo (i32.load8_u (local.get $q)))
          (local.set $bi (i32.load8_u (i32.add (local.get $q) (local.get $w))))
          (local.set $t (i32.add (local.get $hA) (i32.shl (local.get $bo) (i32.const 2))))
          (local.set $c (i32.sub (i32.load (local.get $t)) (i32.const 1)))
          (i32.store (local.get $t) (local.get $c))
          (local.set $a0 (f64.load (i32.add (local.get $inc) (i32.shl (local.get $c) (i32.const 3)))))
          (local.set $t (i32.add (local.get $hA) (i32.shl (local.get $bi) (i32.const 2))))
          (local.set $c (i32.load (local.get $t)))
          (i32.store (local.get $t) (i32.add (local.get $c) (i32.const 1)))
          (local.set $a1 (f64.load (i32.add (local.get $inc) (i32.shl (local.get $c) (i32.const 3)))))
          ;; bottom row: B only
          (local.set $qb (i32.add (i32.add (local.get $q) (local.get $span)) (local.get $W)))
          (local.set $bo (i32.load8_u (local.get $qb)))
          (local.set $bi (i32.load8_u (i32.add (local.get $qb) (local.get $w))))
          (local.set $t (i32.add (local.get $hB) (i32.shl (local.get $bo) (i32.const 2))))
          (local.set $c (i32.sub (i32.load (local.get $t)) (i32.const 1)))
          (i32.store (local.get $t) (local.get $c))
          (local.set $b0 (f64.load (i32.add (local.get $inc) (i32.shl (local.get $c) (i32.const 3)))))
          (local.set $t (i32.add (local.get $hB) (i32.shl (local.get $bi) (i32.const 2))))
          (local.set $c (i32.load (local.get $t)))
          (i32.store (local.get $t) (i32.add (local.get $c) (i32.const 1)))
          (local.set $b1 (f64.load (i32.add (local.get $inc) (i32.shl (local.get $c) (i32.const 3)))))
          ;; shared rows 1 … 2r: read once, applied to A then B
          (local.set $p (i32.add (local.get $q) (local.get $W)))
          (local.set $pe (i32.add (local.get $q) (local.get $span)))
          (loop $rows
            (local.set $bo (i32.load8_u (local.get $p)))
            (local.set $bi (i32.load8_u (i32.add (local.get $p) (local.get $w))))
            (local.set $t (i32.add (local.get $hA) (i32.shl (local.get $bo) (i32.const 2))))
            (local.set $c (i32.sub (i32.load (local.get $t)) (i32.const 1)))
            (i32.store (local.get $t) (local.get $c))
            (local.set $a0 (f64.add (local.get $a0)
              (f64.load (i32.add (local.get $inc) (i32.shl (local.get $c) (i32.const 3))))))
            (local.set $t (i32.add (local.get $hA) (i32.shl (local.get $bi) (i32.const 2))))
            (local.set $c (i32.load (local.get $t)))
            (i32.store (local.get $t) (i32.add (local.get $c) (i32.const 1)))
            (local.set $a1 (f64.add (local.get $a1)
              (f64.load (i32.add (local.get $inc) (i32.shl (local.get $c) (i32.const 3))))))
            (local.set $t (i32.add (local.get $hB) (i32.shl (local.get $bo) (i32.const 2))))
            (local.set $c (i32.sub (i32.load (local.get $t)) (i32.const 1)))
            (i32.store (local.get $t) (local.get $c))
            (local.set $b0 (f64.add (local.get $b0)
              (f64.load (i32.add (local.get $inc) (i32.shl (local.get $c) (i32.const 3))))))
            (local.set $t (i32.add (local.get $hB) (i32.shl (local.get $bi) (i32.const 2))))
            (local.set $c (i32.load (local.get $t)))
            (i32.store (local.get $t) (i32.add (local.get $c) (i32.const 1)))
            (local.set $b1 (f64.add (local.get $b1)
              (f64.load (i32.add (local.get $inc) (i32.shl (local.get $c) (i32.const 3))))))
            (local.set $p (i32.add (local.get $p) (local.get $W)))
            (br_if $rows (i32.le_u (local.get $p) (local.get $pe))))
          (local.set $SA (f64.add (local.get $SA) (f64.sub (local.get $a1) (local.get $a0))))
          (local.set $SB (f64.add (local.get $SB) (f64.sub (local.get $b1) (local.get $b0))))
          (local.set $e (f64.mul (f64.sub (local.get $tN) (local.get $SA)) (local.get $iN)))
          (f32.store (local.get $out) (f32.demote_f64
            (select (local.get $e) (f64.const 0) (f64.gt (local.get $e) (f64.const 0)))))
          (local.set $e (f64.mul (f64.sub (local.get $tN) (local.get $SB)) (local.get $iN)))
          (f32.store (local.get $outB) (f32.demote_f64
            (select (local.get $e) (f64.const 0) (f64.gt (local.get $e) (f64.const 0)))))
          (local.set $out (i32.add (local.get $out) (i32.const 4)))
          (local.set $outB (i32.add (local.get $outB) (i32.const 4)))
          (local.set $q (i32.add (local.get $q) (i32.const 1)))
          (br_if $cols (i32.lt_u (local.get $q) (local.get $end))))))
    (f64.store (i32.const 0) (local.get $SA))
    (f64.store (i32.const 8) (local.get $SB)))
)
