;; Two lanes of the large-signal woofer model in one loop: the step of ./woofer.ts (processBlock,
;; without a passive network or a semi-inductance, in a closed or ported chamber of
;; ../box/one-chamber.ts), each operation done on both lanes at once in f64x2 vectors. Lane 0 and
;; lane 1 are the two channels of one way: the same constants but for the coil's resistance R.
;;
;; Every expression is the TypeScript one, operation for operation and in the same order
;; (a*b*c is (a*b)*c; a - b - c is (a - b) - c); IEEE-754 add, subtract, multiply and divide
;; round alike in both, and each `if` of the TypeScript becomes a select on a comparison mask, so
;; each lane gives the TypeScript model's samples bit for bit (test/woofer-pair.test.ts).
;; |q| is q < 0 ? -q : q, as there (f64x2.abs would turn -0 into +0).
;;
;; Memory (bytes; every value a v128 of [lane 0, lane 1]):
;;   0     constants, 16 bytes each, in the order of the $c_* offsets below
;;   1024  state, 16 bytes each, in the order of the $s_* offsets below (read, run, written back)
;;   the streams, each lane's 256 doubles after the other's (so each is copied in or out whole):
;;   4096  u: drive, V (lane 0; lane 1 from 6144)
;;   8192  p: seat pressure out, Pa (lane 0; lane 1 from 10240)
;;   12288 x: cone excursion out, m (lane 0; lane 1 from 14336)
;;   16384 q: the outlet's probe out, port volume velocity, 0 in a closed box (lane 0; lane 1 from 18432)
;; n is at most 256 (the renderer's chunk).
(module
  (memory (export "memory") 1)
  (func (export "run")
    (param $n i32) (param $nBl i32) (param $nK i32) (param $nL i32) (param $hasLe i32) (param $ported i32)
    ;; constants
    (local $h v128) (local $te v128) (local $R v128) (local $mmsH v128) (local $rms v128) (local $sd v128)
    (local $bl0 v128) (local $k0 v128) (local $le0 v128) (local $xlim v128) (local $kOut v128) (local $invMms v128)
    (local $blFloor v128) (local $kmsFloor v128) (local $leFloor v128)
    (local $b0 v128) (local $b1 v128) (local $b2 v128) (local $b3 v128) (local $b4 v128) (local $b5 v128) (local $b6 v128) (local $b7 v128) (local $b8 v128)
    (local $c0 v128) (local $c1 v128) (local $c2 v128) (local $c3 v128) (local $c4 v128) (local $c5 v128) (local $c6 v128) (local $c7 v128) (local $c8 v128)
    (local $e0 v128) (local $e1 v128) (local $e2 v128) (local $e3 v128) (local $e4 v128) (local $e5 v128) (local $e6 v128) (local $e7 v128) (local $e8 v128)
    (local $cabH v128) (local $g v128) (local $cab v128) (local $gOverCab v128) (local $mapH v128) (local $invMap v128) (local $portLoss v128)
    (local $th v128) (local $tt v128) (local $zero v128) (local $half v128) (local $two v128) (local $one v128) (local $tiny v128) (local $negXlim v128)
    ;; state
    (local $i v128) (local $x v128) (local $v v128) (local $u0 v128) (local $f1 v128) (local $f2 v128) (local $f3 v128)
    (local $leNow v128) (local $le1 v128) (local $j12 v128) (local $j13 v128) (local $j31 v128) (local $j32 v128) (local $out v128)
    (local $pb v128) (local $q v128) (local $f4 v128) (local $f5 v128) (local $d5 v128) (local $p0 v128) (local $p1 v128)
    (local $i2 v128)
    ;; step temporaries
    (local $k i32) (local $at i32)
    (local $u1 v128) (local $r1 v128) (local $d1 v128) (local $d4 v128) (local $r4p v128) (local $absq v128)
    (local $I0 v128) (local $I1 v128) (local $dv v128) (local $dp v128) (local $mHi v128) (local $mLo v128) (local $mask v128)
    (local $bl v128) (local $bl1 v128) (local $kr v128) (local $kr1 v128) (local $fk v128) (local $fk1 v128)
    (local $lr v128) (local $l1 v128) (local $l2 v128) (local $le2 v128) (local $lrel1 v128) (local $dU v128)

    (local.set $h (v128.load offset=0 (i32.const 0)))
    (local.set $te (v128.load offset=16 (i32.const 0)))
    (local.set $R (v128.load offset=32 (i32.const 0)))
    (local.set $mmsH (v128.load offset=48 (i32.const 0)))
    (local.set $rms (v128.load offset=64 (i32.const 0)))
    (local.set $sd (v128.load offset=80 (i32.const 0)))
    (local.set $bl0 (v128.load offset=96 (i32.const 0)))
    (local.set $k0 (v128.load offset=112 (i32.const 0)))
    (local.set $le0 (v128.load offset=128 (i32.const 0)))
    (local.set $xlim (v128.load offset=144 (i32.const 0)))
    (local.set $kOut (v128.load offset=160 (i32.const 0)))
    (local.set $invMms (v128.load offset=176 (i32.const 0)))
    (local.set $blFloor (v128.load offset=192 (i32.const 0)))
    (local.set $kmsFloor (v128.load offset=208 (i32.const 0)))
    (local.set $leFloor (v128.load offset=224 (i32.const 0)))
    (local.set $b0 (v128.load offset=240 (i32.const 0)))
    (local.set $b1 (v128.load offset=256 (i32.const 0)))
    (local.set $b2 (v128.load offset=272 (i32.const 0)))
    (local.set $b3 (v128.load offset=288 (i32.const 0)))
    (local.set $b4 (v128.load offset=304 (i32.const 0)))
    (local.set $b5 (v128.load offset=320 (i32.const 0)))
    (local.set $b6 (v128.load offset=336 (i32.const 0)))
    (local.set $b7 (v128.load offset=352 (i32.const 0)))
    (local.set $b8 (v128.load offset=368 (i32.const 0)))
    (local.set $c0 (v128.load offset=384 (i32.const 0)))
    (local.set $c1 (v128.load offset=400 (i32.const 0)))
    (local.set $c2 (v128.load offset=416 (i32.const 0)))
    (local.set $c3 (v128.load offset=432 (i32.const 0)))
    (local.set $c4 (v128.load offset=448 (i32.const 0)))
    (local.set $c5 (v128.load offset=464 (i32.const 0)))
    (local.set $c6 (v128.load offset=480 (i32.const 0)))
    (local.set $c7 (v128.load offset=496 (i32.const 0)))
    (local.set $c8 (v128.load offset=512 (i32.const 0)))
    (local.set $e0 (v128.load offset=528 (i32.const 0)))
    (local.set $e1 (v128.load offset=544 (i32.const 0)))
    (local.set $e2 (v128.load offset=560 (i32.const 0)))
    (local.set $e3 (v128.load offset=576 (i32.const 0)))
    (local.set $e4 (v128.load offset=592 (i32.const 0)))
    (local.set $e5 (v128.load offset=608 (i32.const 0)))
    (local.set $e6 (v128.load offset=624 (i32.const 0)))
    (local.set $e7 (v128.load offset=640 (i32.const 0)))
    (local.set $e8 (v128.load offset=656 (i32.const 0)))
    (local.set $cabH (v128.load offset=672 (i32.const 0)))
    (local.set $g (v128.load offset=688 (i32.const 0)))
    (local.set $cab (v128.load offset=704 (i32.const 0)))
    (local.set $gOverCab (v128.load offset=720 (i32.const 0)))
    (local.set $mapH (v128.load offset=736 (i32.const 0)))
    (local.set $invMap (v128.load offset=752 (i32.const 0)))
    (local.set $portLoss (v128.load offset=768 (i32.const 0)))
    (local.set $th (f64x2.splat (f64.const 0.5)))
    (local.set $tt (f64x2.splat (f64.const 0.25)))
    (local.set $half (f64x2.splat (f64.const 0.5)))
    (local.set $two (f64x2.splat (f64.const 2)))
    (local.set $one (f64x2.splat (f64.const 1)))
    (local.set $tiny (f64x2.splat (f64.const 1e-9)))
    (local.set $zero (f64x2.splat (f64.const 0)))
    (local.set $negXlim (f64x2.neg (local.get $xlim)))

    (local.set $i (v128.load offset=1024 (i32.const 0)))
    (local.set $x (v128.load offset=1040 (i32.const 0)))
    (local.set $v (v128.load offset=1056 (i32.const 0)))
    (local.set $u0 (v128.load offset=1072 (i32.const 0)))
    (local.set $f1 (v128.load offset=1088 (i32.const 0)))
    (local.set $f2 (v128.load offset=1104 (i32.const 0)))
    (local.set $f3 (v128.load offset=1120 (i32.const 0)))
    (local.set $leNow (v128.load offset=1136 (i32.const 0)))
    (local.set $le1 (v128.load offset=1152 (i32.const 0)))
    (local.set $j12 (v128.load offset=1168 (i32.const 0)))
    (local.set $j13 (v128.load offset=1184 (i32.const 0)))
    (local.set $j31 (v128.load offset=1200 (i32.const 0)))
    (local.set $j32 (v128.load offset=1216 (i32.const 0)))
    (local.set $out (v128.load offset=1232 (i32.const 0)))
    (local.set $pb (v128.load offset=1248 (i32.const 0)))
    (local.set $q (v128.load offset=1264 (i32.const 0)))
    (local.set $f4 (v128.load offset=1280 (i32.const 0)))
    (local.set $f5 (v128.load offset=1296 (i32.const 0)))
    (local.set $d5 (v128.load offset=1312 (i32.const 0)))
    (local.set $p0 (v128.load offset=1328 (i32.const 0)))
    (local.set $p1 (v128.load offset=1344 (i32.const 0)))
    (local.set $i2 (local.get $zero))

    (local.set $k (i32.const 0))
    (block $done
      (loop $step
        (br_if $done (i32.ge_u (local.get $k) (local.get $n)))
        (local.set $at (i32.shl (local.get $k) (i32.const 3)))
        (local.set $u1 (f64x2.replace_lane 1 (f64x2.splat (f64.load offset=4096 (local.get $at))) (f64.load offset=6144 (local.get $at))))
        ;; r1 = f1 + te*(u1 - u0)
        (local.set $r1 (f64x2.add (local.get $f1) (f64x2.mul (local.get $te) (f64x2.sub (local.get $u1) (local.get $u0)))))
        ;; the chamber's prepare()
        (if (local.get $ported)
          (then
            ;; |q|; d5 = mapH + TH*2*portLoss*|q|; d4 = cabH + TH*g + TT/d5; r4p = f4 - TH*f5/d5
            (local.set $absq (v128.bitselect (f64x2.neg (local.get $q)) (local.get $q) (f64x2.lt (local.get $q) (local.get $zero))))
            (local.set $d5 (f64x2.add (local.get $mapH)
              (f64x2.mul (f64x2.mul (f64x2.mul (local.get $th) (local.get $two)) (local.get $portLoss)) (local.get $absq))))
            (local.set $d4 (f64x2.add (f64x2.add (local.get $cabH) (f64x2.mul (local.get $th) (local.get $g)))
              (f64x2.div (local.get $tt) (local.get $d5))))
            (local.set $r4p (f64x2.sub (local.get $f4) (f64x2.div (f64x2.mul (local.get $th) (local.get $f5)) (local.get $d5))))
            (local.set $p0 (f64x2.div (local.get $r4p) (local.get $d4))))
          (else
            ;; d4 = cabH + TH*g; p0 = f4/d4
            (local.set $d4 (f64x2.add (local.get $cabH) (f64x2.mul (local.get $th) (local.get $g))))
            (local.set $p0 (f64x2.div (local.get $f4) (local.get $d4)))))
        ;; p1 = (-TH*sd)/d4
        (local.set $p1 (f64x2.div (f64x2.mul (f64x2.neg (local.get $th)) (local.get $sd)) (local.get $d4)))
        ;; d1 = leNow/h + te*(R + le1*v), at least 1e-9
        (local.set $d1 (f64x2.add (f64x2.div (local.get $leNow) (local.get $h))
          (f64x2.mul (local.get $te) (f64x2.add (local.get $R) (f64x2.mul (local.get $le1) (local.get $v))))))
        (local.set $d1 (v128.bitselect (local.get $tiny) (local.get $d1) (f64x2.lt (local.get $d1) (local.get $tiny))))
        ;; I0 = (r1 + te*j12*h*f2)/d1; I1 = (te*(j12*h*th + j13))/d1
        (local.set $I0 (f64x2.div
          (f64x2.add (local.get $r1) (f64x2.mul (f64x2.mul (f64x2.mul (local.get $te) (local.get $j12)) (local.get $h)) (local.get $f2)))
          (local.get $d1)))
        (local.set $I1 (f64x2.div
          (f64x2.mul (local.get $te) (f64x2.add (f64x2.mul (f64x2.mul (local.get $j12) (local.get $h)) (local.get $th)) (local.get $j13)))
          (local.get $d1)))
        ;; dv = (f3 + th*j31*I0 + th*j32*h*f2 + th*sd*P0) / (mms_h + th*rms - th*j31*I1 - tt*h*j32 - th*sd*P1)
        (local.set $dv (f64x2.div
          (f64x2.add
            (f64x2.add
              (f64x2.add (local.get $f3) (f64x2.mul (f64x2.mul (local.get $th) (local.get $j31)) (local.get $I0)))
              (f64x2.mul (f64x2.mul (f64x2.mul (local.get $th) (local.get $j32)) (local.get $h)) (local.get $f2)))
            (f64x2.mul (f64x2.mul (local.get $th) (local.get $sd)) (local.get $p0)))
          (f64x2.sub
            (f64x2.sub
              (f64x2.sub
                (f64x2.add (local.get $mmsH) (f64x2.mul (local.get $th) (local.get $rms)))
                (f64x2.mul (f64x2.mul (local.get $th) (local.get $j31)) (local.get $I1)))
              (f64x2.mul (f64x2.mul (local.get $tt) (local.get $h)) (local.get $j32)))
            (f64x2.mul (f64x2.mul (local.get $th) (local.get $sd)) (local.get $p1)))))
        ;; i += I0 + I1*dv; x += h*(f2 + th*dv); v += dv
        (local.set $i (f64x2.add (local.get $i) (f64x2.add (local.get $I0) (f64x2.mul (local.get $I1) (local.get $dv)))))
        (local.set $x (f64x2.add (local.get $x) (f64x2.mul (local.get $h) (f64x2.add (local.get $f2) (f64x2.mul (local.get $th) (local.get $dv))))))
        (local.set $v (f64x2.add (local.get $v) (local.get $dv)))
        ;; the chamber's advance(dv)
        (if (local.get $ported)
          (then
            ;; dp = p0 + p1*dv; pb += dp; q += (f5 + TH*dp)/d5
            (local.set $dp (f64x2.add (local.get $p0) (f64x2.mul (local.get $p1) (local.get $dv))))
            (local.set $pb (f64x2.add (local.get $pb) (local.get $dp)))
            (local.set $q (f64x2.add (local.get $q)
              (f64x2.div (f64x2.add (local.get $f5) (f64x2.mul (local.get $th) (local.get $dp))) (local.get $d5)))))
          (else
            (local.set $pb (f64x2.add (local.get $pb) (f64x2.add (local.get $p0) (f64x2.mul (local.get $p1) (local.get $dv)))))))
        ;; the end stops: beyond +-xlim the chamber keeps Sd times the overshoot (coneStopped), the
        ;; cone stands at the stop and any velocity into it ends
        (local.set $mHi (f64x2.gt (local.get $x) (local.get $xlim)))
        (local.set $mLo (f64x2.lt (local.get $x) (local.get $negXlim)))
        (if (v128.any_true (v128.or (local.get $mHi) (local.get $mLo)))
          (then
            (local.set $pb (v128.bitselect
              (f64x2.add (local.get $pb) (f64x2.div (f64x2.mul (local.get $sd) (f64x2.sub (local.get $x) (local.get $xlim))) (local.get $cab)))
              (v128.bitselect
                (f64x2.add (local.get $pb) (f64x2.div (f64x2.mul (local.get $sd) (f64x2.add (local.get $x) (local.get $xlim))) (local.get $cab)))
                (local.get $pb)
                (local.get $mLo))
              (local.get $mHi)))
            (local.set $mask (v128.or
              (v128.and (local.get $mHi) (f64x2.gt (local.get $v) (local.get $zero)))
              (v128.and (local.get $mLo) (f64x2.lt (local.get $v) (local.get $zero)))))
            (local.set $v (v128.bitselect (local.get $zero) (local.get $v) (local.get $mask)))
            (local.set $x (v128.bitselect (local.get $xlim) (v128.bitselect (local.get $negXlim) (local.get $x) (local.get $mLo)) (local.get $mHi)))))
        ;; i2 += i*i
        (local.set $i2 (f64x2.add (local.get $i2) (f64x2.mul (local.get $i) (local.get $i))))
        ;; Bl(x) and its slope by Horner from the top term, floored
        (local.set $bl (local.get $zero))
        (local.set $bl1 (local.get $zero))
        (if (i32.gt_s (local.get $nBl) (i32.const 8)) (then
          (local.set $bl1 (f64x2.add (f64x2.mul (local.get $bl1) (local.get $x)) (local.get $bl)))
          (local.set $bl (f64x2.add (f64x2.mul (local.get $bl) (local.get $x)) (local.get $b8)))))
        (if (i32.gt_s (local.get $nBl) (i32.const 7)) (then
          (local.set $bl1 (f64x2.add (f64x2.mul (local.get $bl1) (local.get $x)) (local.get $bl)))
          (local.set $bl (f64x2.add (f64x2.mul (local.get $bl) (local.get $x)) (local.get $b7)))))
        (if (i32.gt_s (local.get $nBl) (i32.const 6)) (then
          (local.set $bl1 (f64x2.add (f64x2.mul (local.get $bl1) (local.get $x)) (local.get $bl)))
          (local.set $bl (f64x2.add (f64x2.mul (local.get $bl) (local.get $x)) (local.get $b6)))))
        (if (i32.gt_s (local.get $nBl) (i32.const 5)) (then
          (local.set $bl1 (f64x2.add (f64x2.mul (local.get $bl1) (local.get $x)) (local.get $bl)))
          (local.set $bl (f64x2.add (f64x2.mul (local.get $bl) (local.get $x)) (local.get $b5)))))
        (if (i32.gt_s (local.get $nBl) (i32.const 4)) (then
          (local.set $bl1 (f64x2.add (f64x2.mul (local.get $bl1) (local.get $x)) (local.get $bl)))
          (local.set $bl (f64x2.add (f64x2.mul (local.get $bl) (local.get $x)) (local.get $b4)))))
        (if (i32.gt_s (local.get $nBl) (i32.const 3)) (then
          (local.set $bl1 (f64x2.add (f64x2.mul (local.get $bl1) (local.get $x)) (local.get $bl)))
          (local.set $bl (f64x2.add (f64x2.mul (local.get $bl) (local.get $x)) (local.get $b3)))))
        (if (i32.gt_s (local.get $nBl) (i32.const 2)) (then
          (local.set $bl1 (f64x2.add (f64x2.mul (local.get $bl1) (local.get $x)) (local.get $bl)))
          (local.set $bl (f64x2.add (f64x2.mul (local.get $bl) (local.get $x)) (local.get $b2)))))
        (if (i32.gt_s (local.get $nBl) (i32.const 1)) (then
          (local.set $bl1 (f64x2.add (f64x2.mul (local.get $bl1) (local.get $x)) (local.get $bl)))
          (local.set $bl (f64x2.add (f64x2.mul (local.get $bl) (local.get $x)) (local.get $b1)))))
        (local.set $bl1 (f64x2.add (f64x2.mul (local.get $bl1) (local.get $x)) (local.get $bl)))
        (local.set $bl (f64x2.add (f64x2.mul (local.get $bl) (local.get $x)) (local.get $b0)))
        (local.set $mask (f64x2.lt (local.get $bl) (local.get $blFloor)))
        (local.set $bl (v128.bitselect (local.get $blFloor) (local.get $bl) (local.get $mask)))
        (local.set $bl1 (v128.bitselect (local.get $zero) (local.get $bl1) (local.get $mask)))
        (local.set $bl (f64x2.mul (local.get $bl) (local.get $bl0)))
        (local.set $bl1 (f64x2.mul (local.get $bl1) (local.get $bl0)))
        ;; Kms(x) and its slope, floored
        (local.set $kr (local.get $zero))
        (local.set $kr1 (local.get $zero))
        (if (i32.gt_s (local.get $nK) (i32.const 8)) (then
          (local.set $kr1 (f64x2.add (f64x2.mul (local.get $kr1) (local.get $x)) (local.get $kr)))
          (local.set $kr (f64x2.add (f64x2.mul (local.get $kr) (local.get $x)) (local.get $c8)))))
        (if (i32.gt_s (local.get $nK) (i32.const 7)) (then
          (local.set $kr1 (f64x2.add (f64x2.mul (local.get $kr1) (local.get $x)) (local.get $kr)))
          (local.set $kr (f64x2.add (f64x2.mul (local.get $kr) (local.get $x)) (local.get $c7)))))
        (if (i32.gt_s (local.get $nK) (i32.const 6)) (then
          (local.set $kr1 (f64x2.add (f64x2.mul (local.get $kr1) (local.get $x)) (local.get $kr)))
          (local.set $kr (f64x2.add (f64x2.mul (local.get $kr) (local.get $x)) (local.get $c6)))))
        (if (i32.gt_s (local.get $nK) (i32.const 5)) (then
          (local.set $kr1 (f64x2.add (f64x2.mul (local.get $kr1) (local.get $x)) (local.get $kr)))
          (local.set $kr (f64x2.add (f64x2.mul (local.get $kr) (local.get $x)) (local.get $c5)))))
        (if (i32.gt_s (local.get $nK) (i32.const 4)) (then
          (local.set $kr1 (f64x2.add (f64x2.mul (local.get $kr1) (local.get $x)) (local.get $kr)))
          (local.set $kr (f64x2.add (f64x2.mul (local.get $kr) (local.get $x)) (local.get $c4)))))
        (if (i32.gt_s (local.get $nK) (i32.const 3)) (then
          (local.set $kr1 (f64x2.add (f64x2.mul (local.get $kr1) (local.get $x)) (local.get $kr)))
          (local.set $kr (f64x2.add (f64x2.mul (local.get $kr) (local.get $x)) (local.get $c3)))))
        (if (i32.gt_s (local.get $nK) (i32.const 2)) (then
          (local.set $kr1 (f64x2.add (f64x2.mul (local.get $kr1) (local.get $x)) (local.get $kr)))
          (local.set $kr (f64x2.add (f64x2.mul (local.get $kr) (local.get $x)) (local.get $c2)))))
        (if (i32.gt_s (local.get $nK) (i32.const 1)) (then
          (local.set $kr1 (f64x2.add (f64x2.mul (local.get $kr1) (local.get $x)) (local.get $kr)))
          (local.set $kr (f64x2.add (f64x2.mul (local.get $kr) (local.get $x)) (local.get $c1)))))
        (local.set $kr1 (f64x2.add (f64x2.mul (local.get $kr1) (local.get $x)) (local.get $kr)))
        (local.set $kr (f64x2.add (f64x2.mul (local.get $kr) (local.get $x)) (local.get $c0)))
        (local.set $mask (f64x2.lt (local.get $kr) (local.get $kmsFloor)))
        (local.set $kr (v128.bitselect (local.get $kmsFloor) (local.get $kr) (local.get $mask)))
        (local.set $kr1 (v128.bitselect (local.get $zero) (local.get $kr1) (local.get $mask)))
        ;; fk = k0*x*kr; fk1 = k0*(kr + x*kr1)
        (local.set $fk (f64x2.mul (f64x2.mul (local.get $k0) (local.get $x)) (local.get $kr)))
        (local.set $fk1 (f64x2.mul (local.get $k0) (f64x2.add (local.get $kr) (f64x2.mul (local.get $x) (local.get $kr1)))))
        ;; Le(x), its slope and curvature, floored (kept as they were without an inductance)
        (local.set $le2 (local.get $zero))
        (local.set $lrel1 (local.get $zero))
        (if (local.get $hasLe) (then
          (local.set $lr (local.get $zero))
          (local.set $l1 (local.get $zero))
          (local.set $l2 (local.get $zero))
          (if (i32.gt_s (local.get $nL) (i32.const 8)) (then
            (local.set $l2 (f64x2.add (f64x2.mul (local.get $l2) (local.get $x)) (f64x2.mul (local.get $two) (local.get $l1))))
            (local.set $l1 (f64x2.add (f64x2.mul (local.get $l1) (local.get $x)) (local.get $lr)))
            (local.set $lr (f64x2.add (f64x2.mul (local.get $lr) (local.get $x)) (local.get $e8)))))
          (if (i32.gt_s (local.get $nL) (i32.const 7)) (then
            (local.set $l2 (f64x2.add (f64x2.mul (local.get $l2) (local.get $x)) (f64x2.mul (local.get $two) (local.get $l1))))
            (local.set $l1 (f64x2.add (f64x2.mul (local.get $l1) (local.get $x)) (local.get $lr)))
            (local.set $lr (f64x2.add (f64x2.mul (local.get $lr) (local.get $x)) (local.get $e7)))))
          (if (i32.gt_s (local.get $nL) (i32.const 6)) (then
            (local.set $l2 (f64x2.add (f64x2.mul (local.get $l2) (local.get $x)) (f64x2.mul (local.get $two) (local.get $l1))))
            (local.set $l1 (f64x2.add (f64x2.mul (local.get $l1) (local.get $x)) (local.get $lr)))
            (local.set $lr (f64x2.add (f64x2.mul (local.get $lr) (local.get $x)) (local.get $e6)))))
          (if (i32.gt_s (local.get $nL) (i32.const 5)) (then
            (local.set $l2 (f64x2.add (f64x2.mul (local.get $l2) (local.get $x)) (f64x2.mul (local.get $two) (local.get $l1))))
            (local.set $l1 (f64x2.add (f64x2.mul (local.get $l1) (local.get $x)) (local.get $lr)))
            (local.set $lr (f64x2.add (f64x2.mul (local.get $lr) (local.get $x)) (local.get $e5)))))
          (if (i32.gt_s (local.get $nL) (i32.const 4)) (then
            (local.set $l2 (f64x2.add (f64x2.mul (local.get $l2) (local.get $x)) (f64x2.mul (local.get $two) (local.get $l1))))
            (local.set $l1 (f64x2.add (f64x2.mul (local.get $l1) (local.get $x)) (local.get $lr)))
            (local.set $lr (f64x2.add (f64x2.mul (local.get $lr) (local.get $x)) (local.get $e4)))))
          (if (i32.gt_s (local.get $nL) (i32.const 3)) (then
            (local.set $l2 (f64x2.add (f64x2.mul (local.get $l2) (local.get $x)) (f64x2.mul (local.get $two) (local.get $l1))))
            (local.set $l1 (f64x2.add (f64x2.mul (local.get $l1) (local.get $x)) (local.get $lr)))
            (local.set $lr (f64x2.add (f64x2.mul (local.get $lr) (local.get $x)) (local.get $e3)))))
          (if (i32.gt_s (local.get $nL) (i32.const 2)) (then
            (local.set $l2 (f64x2.add (f64x2.mul (local.get $l2) (local.get $x)) (f64x2.mul (local.get $two) (local.get $l1))))
            (local.set $l1 (f64x2.add (f64x2.mul (local.get $l1) (local.get $x)) (local.get $lr)))
            (local.set $lr (f64x2.add (f64x2.mul (local.get $lr) (local.get $x)) (local.get $e2)))))
          (if (i32.gt_s (local.get $nL) (i32.const 1)) (then
            (local.set $l2 (f64x2.add (f64x2.mul (local.get $l2) (local.get $x)) (f64x2.mul (local.get $two) (local.get $l1))))
            (local.set $l1 (f64x2.add (f64x2.mul (local.get $l1) (local.get $x)) (local.get $lr)))
            (local.set $lr (f64x2.add (f64x2.mul (local.get $lr) (local.get $x)) (local.get $e1)))))
          (local.set $l2 (f64x2.add (f64x2.mul (local.get $l2) (local.get $x)) (f64x2.mul (local.get $two) (local.get $l1))))
          (local.set $l1 (f64x2.add (f64x2.mul (local.get $l1) (local.get $x)) (local.get $lr)))
          (local.set $lr (f64x2.add (f64x2.mul (local.get $lr) (local.get $x)) (local.get $e0)))
          (local.set $mask (f64x2.lt (local.get $lr) (local.get $leFloor)))
          (local.set $lr (v128.bitselect (local.get $leFloor) (local.get $lr) (local.get $mask)))
          (local.set $l1 (v128.bitselect (local.get $zero) (local.get $l1) (local.get $mask)))
          (local.set $l2 (v128.bitselect (local.get $zero) (local.get $l2) (local.get $mask)))
          (local.set $leNow (f64x2.mul (local.get $le0) (local.get $lr)))
          (local.set $le1 (f64x2.mul (local.get $le0) (local.get $l1)))
          (local.set $le2 (f64x2.mul (local.get $le0) (local.get $l2)))
          (local.set $lrel1 (f64x2.div (local.get $l1) (local.get $lr)))))
        ;; f1 = u1 - R*i - le1*v*i - bl*v; f2 = v
        (local.set $f1 (f64x2.sub
          (f64x2.sub
            (f64x2.sub (local.get $u1) (f64x2.mul (local.get $R) (local.get $i)))
            (f64x2.mul (f64x2.mul (local.get $le1) (local.get $v)) (local.get $i)))
          (f64x2.mul (local.get $bl) (local.get $v))))
        (local.set $f2 (local.get $v))
        ;; f3 = bl*i - rms*v - fk + sd*pb + 0.5*le1*i*i
        (local.set $f3 (f64x2.add
          (f64x2.add
            (f64x2.sub
              (f64x2.sub (f64x2.mul (local.get $bl) (local.get $i)) (f64x2.mul (local.get $rms) (local.get $v)))
              (local.get $fk))
            (f64x2.mul (local.get $sd) (local.get $pb)))
          (f64x2.mul (f64x2.mul (f64x2.mul (local.get $half) (local.get $le1)) (local.get $i)) (local.get $i))))
        ;; j12 = -v*(i*le2 + bl1) - f1*lrel1; j13 = -(le1*i + bl); j31 = bl + le1*i; j32 = bl1*i - fk1 + 0.5*le2*i*i
        (local.set $j12 (f64x2.sub
          (f64x2.mul (f64x2.neg (local.get $v)) (f64x2.add (f64x2.mul (local.get $i) (local.get $le2)) (local.get $bl1)))
          (f64x2.mul (local.get $f1) (local.get $lrel1))))
        (local.set $j13 (f64x2.neg (f64x2.add (f64x2.mul (local.get $le1) (local.get $i)) (local.get $bl))))
        (local.set $j31 (f64x2.add (local.get $bl) (f64x2.mul (local.get $le1) (local.get $i))))
        (local.set $j32 (f64x2.add
          (f64x2.sub (f64x2.mul (local.get $bl1) (local.get $i)) (local.get $fk1))
          (f64x2.mul (f64x2.mul (f64x2.mul (local.get $half) (local.get $le2)) (local.get $i)) (local.get $i))))
        ;; the chamber's evaluate(v, sd*f3*invMms)
        (local.set $dU (f64x2.mul (f64x2.mul (local.get $sd) (local.get $f3)) (local.get $invMms)))
        (if (local.get $ported)
          (then
            ;; f4 = -sd*v - q - g*pb; f5 = pb - portLoss*q*|q|; dU + f5*invMap + gOverCab*f4
            (local.set $f4 (f64x2.sub
              (f64x2.sub (f64x2.mul (f64x2.neg (local.get $sd)) (local.get $v)) (local.get $q))
              (f64x2.mul (local.get $g) (local.get $pb))))
            (local.set $absq (v128.bitselect (f64x2.neg (local.get $q)) (local.get $q) (f64x2.lt (local.get $q) (local.get $zero))))
            (local.set $f5 (f64x2.sub (local.get $pb) (f64x2.mul (f64x2.mul (local.get $portLoss) (local.get $q)) (local.get $absq))))
            (local.set $dU (f64x2.add
              (f64x2.add (local.get $dU) (f64x2.mul (local.get $f5) (local.get $invMap)))
              (f64x2.mul (local.get $gOverCab) (local.get $f4))))
            (f64.store offset=16384 (local.get $at) (f64x2.extract_lane 0 (local.get $q)))
            (f64.store offset=18432 (local.get $at) (f64x2.extract_lane 1 (local.get $q))))
          (else
            ;; f4 = -sd*v - g*pb; dU + gOverCab*f4
            (local.set $f4 (f64x2.sub (f64x2.mul (f64x2.neg (local.get $sd)) (local.get $v)) (f64x2.mul (local.get $g) (local.get $pb))))
            (local.set $dU (f64x2.add (local.get $dU) (f64x2.mul (local.get $gOverCab) (local.get $f4))))
            (f64.store offset=16384 (local.get $at) (f64.const 0))
            (f64.store offset=18432 (local.get $at) (f64.const 0))))
        (local.set $out (f64x2.mul (local.get $kOut) (local.get $dU)))
        (f64.store offset=8192 (local.get $at) (f64x2.extract_lane 0 (local.get $out)))
        (f64.store offset=10240 (local.get $at) (f64x2.extract_lane 1 (local.get $out)))
        (f64.store offset=12288 (local.get $at) (f64x2.extract_lane 0 (local.get $x)))
        (f64.store offset=14336 (local.get $at) (f64x2.extract_lane 1 (local.get $x)))
        (local.set $u0 (local.get $u1))
        (local.set $k (i32.add (local.get $k) (i32.const 1)))
        (br $step)))

    (v128.store offset=1024 (i32.const 0) (local.get $i))
    (v128.store offset=1040 (i32.const 0) (local.get $x))
    (v128.store offset=1056 (i32.const 0) (local.get $v))
    (v128.store offset=1072 (i32.const 0) (local.get $u0))
    (v128.store offset=1088 (i32.const 0) (local.get $f1))
    (v128.store offset=1104 (i32.const 0) (local.get $f2))
    (v128.store offset=1120 (i32.const 0) (local.get $f3))
    (v128.store offset=1136 (i32.const 0) (local.get $leNow))
    (v128.store offset=1152 (i32.const 0) (local.get $le1))
    (v128.store offset=1168 (i32.const 0) (local.get $j12))
    (v128.store offset=1184 (i32.const 0) (local.get $j13))
    (v128.store offset=1200 (i32.const 0) (local.get $j31))
    (v128.store offset=1216 (i32.const 0) (local.get $j32))
    (v128.store offset=1232 (i32.const 0) (local.get $out))
    (v128.store offset=1248 (i32.const 0) (local.get $pb))
    (v128.store offset=1264 (i32.const 0) (local.get $q))
    (v128.store offset=1280 (i32.const 0) (local.get $f4))
    (v128.store offset=1296 (i32.const 0) (local.get $f5))
    (v128.store offset=1312 (i32.const 0) (local.get $d5))
    (v128.store offset=1328 (i32.const 0) (local.get $p0))
    (v128.store offset=1344 (i32.const 0) (local.get $p1))
    (v128.store offset=1360 (i32.const 0) (local.get $i2))))
