;; One output row of the local variance / standard deviation in WebAssembly (see
;; boxMomentsKernel.ts for the method and border rule), with the same operations in the same order
;; as the JavaScript varRow, so both give identical output.
;;
;; The column sums are interleaved, col[x] = (Σx, Σx²) as one 128-bit pair, so the horizontal
;; running sums (s, q) slide with one SIMD add per pixel; in the interior the output step
;; (mean, variance, square root, clamp, rounding to f32) is done for two pixels at once. The vertical update (col[x] += (a − b,
;; a·a − b·b)) is done first for the whole row, two columns at a time; that gives the same values
;; as the fused JavaScript loop (every column is updated exactly once per row, before it is read).
;; The square root of a negative variance is NaN, which the final v > 0 test turns into 0, as the
;; JavaScript does. All addresses are byte offsets into the exported memory, laid out by
;; boxMomentsWasm.ts. Build: npm run build:wasm (scripts/build-wasm.mjs, wabt).
(module
  (memory (export "memory") 1)

  ;; $col       interleaved column sums (f64 pairs × W), updated in place
  ;; $pin       entering source row (f32 × W), $pout leaving row (equal to $pin for row 0)
  ;; $out       output row (f32 × W)
  ;; $W, $r     width and half window (2r + 1 ≤ W); $inv = 1 / (2r + 1)²
  ;; $sq        1: write the standard deviation, 0: the variance
  (func (export "varRow")
    (param $col i32) (param $pin i32) (param $pout i32) (param $out i32)
    (param $W i32) (param $r i32) (param $inv f64) (param $sq i32)
    (local $x i32) (local $k i32) (local $t i32) (local $pe i32)
    (local $pa i32) (local $ps i32) (local $po i32) 
    (local $a v128) (local $b v128) (local $d v128) (local $q2 v128) (local $acc v128)
    (local $fa f64) (local $fb f64) (local $m f64) (local $v f64) (local $vinv v128)
    (local.set $x (i32.const 0))
    (block $vdone
      (loop $vert
        (br_if $vdone (i32.gt_s (i32.add (local.get $x) (i32.const 2)) (local.get $W)))
        (local.set $a (f64x2.promote_low_f32x4
          (v128.load64_zero (i32.add (local.get $pin) (i32.shl (local.get $x) (i32.const 2))))))
        (local.set $b (f64x2.promote_low_f32x4
          (v128.load64_zero (i32.add (local.get $pout) (i32.shl (local.get $x) (i32.const 2))))))
        (local.set $d (f64x2.sub (local.get $a) (local.get $b)))
        (local.set $q2 (f64x2.sub (f64x2.mul (local.get $a) (local.get $a)) (f64x2.mul (local.get $b) (local.get $b))))
        (local.set $t (i32.shl (local.get $x) (i32.const 4)))
        (v128.store (i32.add (local.get $col) (local.get $t))
          (f64x2.add (v128.load (i32.add (local.get $col) (local.get $t)))
          (i8x16.shuffle 0 1 2 3 4 5 6 7 16 17 18 19 20 21 22 23 (local.get $d) (local.get $q2))))
        (v128.store offset=16 (i32.add (local.get $col) (local.get $t))
          (f64x2.add (v128.load offset=16 (i32.add (local.get $col) (local.get $t)))
          (i8x16.shuffle 8 9 10 11 12 13 14 15 24 25 26 27 28 29 30 31 (local.get $d) (local.get $q2))))
        (local.set $x (i32.add (local.get $x) (i32.const 2)))
        (br $vert)))
    (if (i32.lt_s (local.get $x) (local.get $W))
      (then
        (local.set $fa (f64.promote_f32 (f32.load (i32.add (local.get $pin) (i32.shl (local.get $x) (i32.const 2))))))
        (local.set $fb (f64.promote_f32 (f32.load (i32.add (local.get $pout) (i32.shl (local.get $x) (i32.const 2))))))
        (local.set $t (i32.shl (local.get $x) (i32.const 4)))
        (v128.store (i32.add (local.get $col) (local.get $t))
          (f64x2.add (v128.load (i32.add (local.get $col) (local.get $t)))
          (f64x2.replace_lane 1
            (f64x2.splat (f64.sub (local.get $fa) (local.get $fb)))
            (f64.sub (f64.mul (local.get $fa) (local.get $fa)) (f64.mul (local.get $fb) (local.get $fb))))))))

    (local.set $acc (v128.const i64x2 0 0))
    (local.set $k (i32.sub (i32.const 0) (local.get $r)))
    (loop $first
      (local.set $acc (f64x2.add (local.get $acc)
        (v128.load (i32.add (local.get $col) (i32.shl (select (i32.sub (i32.const 0) (local.get $k)) (local.get $k) (i32.lt_s (local.get $k) (i32.const 0))) (i32.const 4))))))
      (local.set $k (i32.add (local.get $k) (i32.const 1)))
      (br_if $first (i32.le_s (local.get $k) (local.get $r))))
    (local.set $x (i32.const 0))
        (local.set $m (f64.mul (f64x2.extract_lane 0 (local.get $acc)) (local.get $inv)))
        (local.set $v (f64.sub (f64.mul (f64x2.extract_lane 1 (local.get $acc)) (local.get $inv))
          (f64.mul (local.get $m) (local.get $m))))
        (if (local.get $sq) (then (local.set $v (f64.sqrt (local.get $v)))))
        (f32.store (i32.add (local.get $out) (i32.shl (local.get $x) (i32.const 2))) (f32.demote_f64
          (select (local.get $v) (f64.const 0) (f64.gt (local.get $v) (f64.const 0)))))
    (local.set $x (i32.const 1))
    (block $ldone
      (loop $left
        (br_if $ldone (i32.gt_s (local.get $x) (local.get $r)))
        (local.set $acc (f64x2.add (local.get $acc) (f64x2.sub
          (v128.load (i32.add (local.get $col) (i32.shl (i32.add (local.get $x) (local.get $r)) (i32.const 4))))
          (v128.load (i32.add (local.get $col) (i32.shl (i32.sub (i32.add (local.get $r) (i32.const 1)) (local.get $x)) (i32.const 4)))))))
        (local.set $m (f64.mul (f64x2.extract_lane 0 (local.get $acc)) (local.get $inv)))
        (local.set $v (f64.sub (f64.mul (f64x2.extract_lane 1 (local.get $acc)) (local.get $inv))
          (f64.mul (local.get $m) (local.get $m))))
        (if (local.get $sq) (then (local.set $v (f64.sqrt (local.get $v)))))
        (f32.store (i32.add (local.get $out) (i32.shl (local.get $x) (i32.const 2))) (f32.demote_f64
          (select (local.get $v) (f64.const 0) (f64.gt (local.get $v) (f64.const 0)))))
        (local.set $x (i32.add (local.get $x) (i32.const 1)))
        (br $left)))

    (local.set $pa (i32.add (local.get $col) (i32.shl (i32.add (i32.add (local.get $r) (i32.const 1)) (local.get $r)) (i32.const 4))))
    (local.set $ps (local.get $col))
    (local.set $po (i32.add (local.get $out) (i32.shl (i32.add (local.get $r) (i32.const 1)) (i32.const 2))))
    (local.set $pe (i32.add (local.get $out) (i32.shl (i32.sub (local.get $W) (local.get $r)) (i32.const 2))))
    (local.set $vinv (f64x2.splat (local.get $inv)))
    (block $idone
      (loop $inner
        (br_if $idone (i32.gt_u (i32.add (local.get $po) (i32.const 8)) (local.get $pe)))
        (local.set $a (f64x2.add (local.get $acc)
          (f64x2.sub (v128.load (local.get $pa)) (v128.load (local.get $ps)))))
        (local.set $acc (f64x2.add (local.get $a)
          (f64x2.sub (v128.load offset=16 (local.get $pa)) (v128.load offset=16 (local.get $ps)))))
        ;; (s0, s1) and (q0, q1)
        (local.set $d (i8x16.shuffle 0 1 2 3 4 5 6 7 16 17 18 19 20 21 22 23 (local.get $a) (local.get $acc)))
        (local.set $q2 (i8x16.shuffle 8 9 10 11 12 13 14 15 24 25 26 27 28 29 30 31 (local.get $a) (local.get $acc)))
        (local.set $b (f64x2.mul (local.get $d) (local.get $vinv)))
        (local.set $b (f64x2.sub (f64x2.mul (local.get $q2) (local.get $vinv)) (f64x2.mul (local.get $b) (local.get $b))))
        (if (local.get $sq) (then (local.set $b (f64x2.sqrt (local.get $b)))))
        (v128.store64_lane 0 (local.get $po) (f32x4.demote_f64x2_zero
          (v128.and (local.get $b) (f64x2.gt (local.get $b) (v128.const f64x2 0 0)))))
        (local.set $pa (i32.add (local.get $pa) (i32.const 32)))
        (local.set $ps (i32.add (local.get $ps) (i32.const 32)))
        (local.set $po (i32.add (local.get $po) (i32.const 8)))
        (br $inner)))
    (if (i32.lt_u (local.get $po) (local.get $pe))
      (then
        (local.set $acc (f64x2.add (local.get $acc)
          (f64x2.sub (v128.load (local.get $pa)) (v128.load (local.get $ps)))))
        (local.set $m (f64.mul (f64x2.extract_lane 0 (local.get $acc)) (local.get $inv)))
        (local.set $v (f64.sub (f64.mul (f64x2.extract_lane 1 (local.get $acc)) (local.get $inv))
          (f64.mul (local.get $m) (local.get $m))))
        (if (local.get $sq) (then (local.set $v (f64.sqrt (local.get $v)))))
        (f32.store (local.get $po) (f32.demote_f64
          (select (local.get $v) (f64.const 0) (f64.gt (local.get $v) (f64.const 0)))))))

    (local.set $x (i32.sub (local.get $W) (local.get $r)))
    (block $rdone
      (loop $right
        (br_if $rdone (i32.ge_s (local.get $x) (local.get $W)))
        (local.set $acc (f64x2.add (local.get $acc) (f64x2.sub
          (v128.load (i32.add (local.get $col) (i32.shl (i32.sub (i32.shl (i32.sub (local.get $W) (i32.const 1)) (i32.const 1)) (i32.add (local.get $x) (local.get $r))) (i32.const 4))))
          (v128.load (i32.add (local.get $col) (i32.shl (i32.sub (i32.sub (local.get $x) (local.get $r)) (i32.const 1)) (i32.const 4)))))))
        (local.set $m (f64.mul (f64x2.extract_lane 0 (local.get $acc)) (local.get $inv)))
        (local.set $v (f64.sub (f64.mul (f64x2.extract_lane 1 (local.get $acc)) (local.get $inv))
          (f64.mul (local.get $m) (local.get $m))))
        (if (local.get $sq) (then (local.set $v (f64.sqrt (local.get $v)))))
        (f32.store (i32.add (local.get $out) (i32.shl (local.get $x) (i32.const 2))) (f32.demote_f64
          (select (local.get $v) (f64.const 0) (f64.gt (local.get $v) (f64.const 0)))))
        (local.set $x (i32.add (local.get $x) (i32.const 1)))
        (br $right)))
)

)
