/**
 * The stage sums of one Dormand–Prince 8(5,3) trial step (coefficients in dop853-coefficients.ts), over a
 * range of components so that a stepper may integrate a state's head and tail in separate passes.
 */
import * as K from './dop853-coefficients.ts';

/** Finishes stage `stage` of a trial step: its derivative at (t, y) into dydt. */
export type StageCall = (stage: number, t: number, y: Float64Array, dydt: Float64Array) => void;

/**
 * Stages 2..12 of a trial step of size h from (t, y) with slope k1 = f(t, y), for components [lo, hi):
 * each stage's argument into yt, then `call(stage, t_stage, yt, k[stage])` writes its derivative.
 * k holds the stage vectors by stage number (k[2..12] used here).
 */
export function trialStages(h: number, lo: number, hi: number, t: number, y: Float64Array, k1: Float64Array,
  k: readonly Float64Array[], yt: Float64Array, call: StageCall): void {
  const [, , k2, k3, k4, k5, k6, k7, k8, k9, k10, k11, k12] = k;
  for (let i = lo; i < hi; i++) yt[i] = y[i] + h * K.a21 * k1[i];
  call(2, t + K.c2 * h, yt, k2);
  for (let i = lo; i < hi; i++) yt[i] = y[i] + h * (K.a31 * k1[i] + K.a32 * k2[i]);
  call(3, t + K.c3 * h, yt, k3);
  for (let i = lo; i < hi; i++) yt[i] = y[i] + h * (K.a41 * k1[i] + K.a43 * k3[i]);
  call(4, t + K.c4 * h, yt, k4);
  for (let i = lo; i < hi; i++) yt[i] = y[i] + h * (K.a51 * k1[i] + K.a53 * k3[i] + K.a54 * k4[i]);
  call(5, t + K.c5 * h, yt, k5);
  for (let i = lo; i < hi; i++) yt[i] = y[i] + h * (K.a61 * k1[i] + K.a64 * k4[i] + K.a65 * k5[i]);
  call(6, t + K.c6 * h, yt, k6);
  for (let i = lo; i < hi; i++) yt[i] = y[i] + h * (K.a71 * k1[i] + K.a74 * k4[i] + K.a75 * k5[i] + K.a76 * k6[i]);
  call(7, t + K.c7 * h, yt, k7);
  for (let i = lo; i < hi; i++) {
    yt[i] = y[i] + h * (K.a81 * k1[i] + K.a84 * k4[i] + K.a85 * k5[i] + K.a86 * k6[i] + K.a87 * k7[i]);
  }
  call(8, t + K.c8 * h, yt, k8);
  for (let i = lo; i < hi; i++) {
    yt[i] = y[i] + h * (K.a91 * k1[i] + K.a94 * k4[i] + K.a95 * k5[i] + K.a96 * k6[i] + K.a97 * k7[i]
      + K.a98 * k8[i]);
  }
  call(9, t + K.c9 * h, yt, k9);
  for (let i = lo; i < hi; i++) {
    yt[i] = y[i] + h * (K.a101 * k1[i] + K.a104 * k4[i] + K.a105 * k5[i] + K.a106 * k6[i] + K.a107 * k7[i]
      + K.a108 * k8[i] + K.a109 * k9[i]);
  }
  call(10, t + K.c10 * h, yt, k10);
  for (let i = lo; i < hi; i++) {
    yt[i] = y[i] + h * (K.a111 * k1[i] + K.a114 * k4[i] + K.a115 * k5[i] + K.a116 * k6[i] + K.a117 * k7[i]
      + K.a118 * k8[i] + K.a119 * k9[i] + K.a1110 * k10[i]);
  }
  call(11, t + K.c11 * h, yt, k11);
  for (let i = lo; i < hi; i++) {
    yt[i] = y[i] + h * (K.a121 * k1[i] + K.a124 * k4[i] + K.a125 * k5[i] + K.a126 * k6[i] + K.a127 * k7[i]
      + K.a128 * k8[i] + K.a129 * k9[i] + K.a1210 * k10[i] + K.a1211 * k11[i]);
  }
  call(12, t + h, yt, k12);
}
