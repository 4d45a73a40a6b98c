;; Two joined cascades (./biquad.ts JoinedCascade) over the same input in one loop: lane 0 and lane
;; 1 are two ways of one channel in the calibration pass, each with its own sections and gains, the
;; shorter padded with pass-through sections (gain 1, b0 1, the rest 0). Each group of four sections
;; runs over the whole block as JoinedCascade.four does, every expression in the same order
;; (z1 = b1*x - a1*y + z2 is ((b1*x) - (a1*y)) + z2), on both lanes at once in f64x2 vectors, so
;; each lane's samples are JoinedCascade's bit for bit but for the sign of a zero in the padding
;; (test/cascade-pair.test.ts).
;;
;; Memory (bytes; every coefficient and state a v128 of [lane 0, lane 1]):
;;   0     sections, 96 bytes each: pre-gain, b0, b1, b2, a1, a2 (at most 40 sections)
;;   4096  state, 32 bytes per section: s1, s2
;;   8192  x: the block's input, n doubles (both lanes start from it)
;;   73728 the block as it runs, n v128 (lane 0, lane 1)
;;   204800 lane 0 out, n doubles; 270336 lane 1 out, n doubles
;; n is at most 8192; groups (of four sections) at most 10.
(module
  (memory (export "memory") 6)
  (func (export "run") (param $n i32) (param $groups i32)
    (local $g i32) (local $j i32) (local $c i32) (local $s i32) (local $at i32)
    (local $p0 v128) (local $p1 v128) (local $p2 v128) (local $p3 v128)
    (local $b0 v128) (local $b1 v128) (local $b2 v128) (local $a1 v128) (local $a2 v128)
    (local $c0 v128) (local $c1 v128) (local $c2 v128) (local $d1 v128) (local $d2 v128)
    (local $e0 v128) (local $e1 v128) (local $e2 v128) (local $f1 v128) (local $f2 v128)
    (local $g0 v128) (local $g1 v128) (local $g2 v128) (local $h1 v128) (local $h2 v128)
    (local $z1 v128) (local $z2 v128) (local $w1 v128) (local $w2 v128)
    (local $u1 v128) (local $u2 v128) (local $v1 v128) (local $v2 v128)
    (local $x v128) (local $y v128)
    (local.set $g (i32.const 0))
    (block $groupsDone
      (loop $group
        (br_if $groupsDone (i32.ge_u (local.get $g) (local.get $groups)))
        ;; this group's four sections: coefficients at $c, state at $s
        (local.set $c (i32.mul (local.get $g) (i32.const 384)))
        (local.set $s (i32.add (i32.const 4096) (i32.mul (local.get $g) (i32.const 128))))
        (local.set $p0 (v128.load offset=0 (local.get $c)))
        (local.set $b0 (v128.load offset=16 (local.get $c)))
        (local.set $b1 (v128.load offset=32 (local.get $c)))
        (local.set $b2 (v128.load offset=48 (local.get $c)))
        (local.set $a1 (v128.load offset=64 (local.get $c)))
        (local.set $a2 (v128.load offset=80 (local.get $c)))
        (local.set $p1 (v128.load offset=96 (local.get $c)))
        (local.set $c0 (v128.load offset=112 (local.get $c)))
        (local.set $c1 (v128.load offset=128 (local.get $c)))
        (local.set $c2 (v128.load offset=144 (local.get $c)))
        (local.set $d1 (v128.load offset=160 (local.get $c)))
        (local.set $d2 (v128.load offset=176 (local.get $c)))
        (local.set $p2 (v128.load offset=192 (local.get $c)))
        (local.set $e0 (v128.load offset=208 (local.get $c)))
        (local.set $e1 (v128.load offset=224 (local.get $c)))
        (local.set $e2 (v128.load offset=240 (local.get $c)))
        (local.set $f1 (v128.load offset=256 (local.get $c)))
        (local.set $f2 (v128.load offset=272 (local.get $c)))
        (local.set $p3 (v128.load offset=288 (local.get $c)))
        (local.set $g0 (v128.load offset=304 (local.get $c)))
        (local.set $g1 (v128.load offset=320 (local.get $c)))
        (local.set $g2 (v128.load offset=336 (local.get $c)))
        (local.set $h1 (v128.load offset=352 (local.get $c)))
        (local.set $h2 (v128.load offset=368 (local.get $c)))
        (local.set $z1 (v128.load offset=0 (local.get $s)))
        (local.set $z2 (v128.load offset=16 (local.get $s)))
        (local.set $w1 (v128.load offset=32 (local.get $s)))
        (local.set $w2 (v128.load offset=48 (local.get $s)))
        (local.set $u1 (v128.load offset=64 (local.get $s)))
        (local.set $u2 (v128.load offset=80 (local.get $s)))
        (local.set $v1 (v128.load offset=96 (local.get $s)))
        (local.set $v2 (v128.load offset=112 (local.get $s)))
        (local.set $j (i32.const 0))
        (block $blockDone
          (loop $sample
            (br_if $blockDone (i32.ge_u (local.get $j) (local.get $n)))
            (local.set $at (i32.shl (local.get $j) (i32.const 4)))
            ;; the first group reads the input, the others the block as it runs
            (if (i32.eqz (local.get $g))
              (then (local.set $x (f64x2.splat (f64.load offset=8192 (i32.shl (local.get $j) (i32.const 3))))))
              (else (local.set $x (v128.load offset=73728 (local.get $at)))))
            ;; section 1
            (local.set $x (f64x2.mul (local.get $x) (local.get $p0)))
            (local.set $y (f64x2.add (f64x2.mul (local.get $b0) (local.get $x)) (local.get $z1)))
            (local.set $z1 (f64x2.add (f64x2.sub (f64x2.mul (local.get $b1) (local.get $x)) (f64x2.mul (local.get $a1) (local.get $y))) (local.get $z2)))
            (local.set $z2 (f64x2.sub (f64x2.mul (local.get $b2) (local.get $x)) (f64x2.mul (local.get $a2) (local.get $y))))
            ;; section 2
            (local.set $x (f64x2.mul (local.get $y) (local.get $p1)))
            (local.set $y (f64x2.add (f64x2.mul (local.get $c0) (local.get $x)) (local.get $w1)))
            (local.set $w1 (f64x2.add (f64x2.sub (f64x2.mul (local.get $c1) (local.get $x)) (f64x2.mul (local.get $d1) (local.get $y))) (local.get $w2)))
            (local.set $w2 (f64x2.sub (f64x2.mul (local.get $c2) (local.get $x)) (f64x2.mul (local.get $d2) (local.get $y))))
            ;; section 3
            (local.set $x (f64x2.mul (local.get $y) (local.get $p2)))
            (local.set $y (f64x2.add (f64x2.mul (local.get $e0) (local.get $x)) (local.get $u1)))
            (local.set $u1 (f64x2.add (f64x2.sub (f64x2.mul (local.get $e1) (local.get $x)) (f64x2.mul (local.get $f1) (local.get $y))) (local.get $u2)))
            (local.set $u2 (f64x2.sub (f64x2.mul (local.get $e2) (local.get $x)) (f64x2.mul (local.get $f2) (local.get $y))))
            ;; section 4
            (local.set $x (f64x2.mul (local.get $y) (local.get $p3)))
            (local.set $y (f64x2.add (f64x2.mul (local.get $g0) (local.get $x)) (local.get $v1)))
            (local.set $v1 (f64x2.add (f64x2.sub (f64x2.mul (local.get $g1) (local.get $x)) (f64x2.mul (local.get $h1) (local.get $y))) (local.get $v2)))
            (local.set $v2 (f64x2.sub (f64x2.mul (local.get $g2) (local.get $x)) (f64x2.mul (local.get $h2) (local.get $y))))
            (v128.store offset=73728 (local.get $at) (local.get $y))
            (local.set $j (i32.add (local.get $j) (i32.const 1)))
            (br $sample)))
        (v128.store offset=0 (local.get $s) (local.get $z1))
        (v128.store offset=16 (local.get $s) (local.get $z2))
        (v128.store offset=32 (local.get $s) (local.get $w1))
        (v128.store offset=48 (local.get $s) (local.get $w2))
        (v128.store offset=64 (local.get $s) (local.get $u1))
        (v128.store offset=80 (local.get $s) (local.get $u2))
        (v128.store offset=96 (local.get $s) (local.get $v1))
        (v128.store offset=112 (local.get $s) (local.get $v2))
        (local.set $g (i32.add (local.get $g) (i32.const 1)))
        (br $group)))
    ;; the lanes apart
    (local.set $j (i32.const 0))
    (block $splitDone
      (loop $split
        (br_if $splitDone (i32.ge_u (local.get $j) (local.get $n)))
        (local.set $y (v128.load offset=73728 (i32.shl (local.get $j) (i32.const 4))))
        (f64.store offset=204800 (i32.shl (local.get $j) (i32.const 3)) (f64x2.extract_lane 0 (local.get $y)))
        (f64.store offset=270336 (i32.shl (local.get $j) (i32.const 3)) (f64x2.extract_lane 1 (local.get $y)))
        (local.set $j (i32.add (local.get $j) (i32.const 1)))
        (br $split)))))
