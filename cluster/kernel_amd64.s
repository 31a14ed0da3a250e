//go:build amd64 && !purego

#include "textflag.h"

// func ward8AVX2(x *[8]float64, c *float64, d int, w *float64, out []float64, mask *uint64, ww, lim, limwx float64)
// For k < len(out): out[k] is the partial sum as above, and bit k%64 of
// mask[k/64] is set when w[k]·(out[k]·ww − lim) ≤ limwx, i.e. when the
// candidate survives the pruning test.
TEXT ·ward8AVX2(SB), NOSPLIT, $0-88
	MOVQ x+0(FP), AX
	MOVQ c+8(FP), SI
	MOVQ d+16(FP), DX
	MOVQ w+24(FP), R8
	MOVQ out_base+32(FP), DI
	MOVQ out_len+40(FP), R12
	MOVQ mask+56(FP), R9
	VMOVSD ww+64(FP), X5
	VMOVSD lim+72(FP), X6
	VMOVSD limwx+80(FP), X7
	SHLQ $3, DX
	VMOVUPD (AX), Y0
	VMOVUPD 32(AX), Y1
	XORQ CX, CX                // bit index within the current word
	XORQ R11, R11              // current mask word

wloop:
	TESTQ R12, R12
	JZ    wdone
	VMOVUPD (SI), Y2
	VMOVUPD 32(SI), Y3
	VSUBPD  Y2, Y0, Y2
	VSUBPD  Y3, Y1, Y3
	VMULPD  Y2, Y2, Y2
	VMULPD  Y3, Y3, Y3
	VADDPD  Y3, Y2, Y2
	VEXTRACTF128 $1, Y2, X3
	VADDPD  X3, X2, X2
	VPERMILPD $1, X2, X3
	VADDSD  X3, X2, X2
	VMOVSD  X2, (DI)
	VMULSD  X5, X2, X4         // s·ww
	VSUBSD  X6, X4, X4         // s·ww − lim
	VMULSD  (R8), X4, X4       // w·(s·ww − lim)
	XORQ    BX, BX
	VUCOMISD X7, X4
	SETLS   BX                 // survive when X4 ≤ limwx
	SHLQ    CX, BX
	ORQ     BX, R11
	ADDQ    DX, SI
	ADDQ    $8, DI
	ADDQ    $8, R8
	INCQ    CX
	CMPQ    CX, $64
	JNE     wnext
	MOVQ    R11, (R9)
	ADDQ    $8, R9
	XORQ    CX, CX
	XORQ    R11, R11

wnext:
	DECQ    R12
	JMP     wloop

wdone:
	TESTQ   CX, CX
	JZ      wret
	MOVQ    R11, (R9)

wret:
	VZEROUPPER
	RET

// func sqdistAVX2(a, b *float64, n int) float64
// Four lanes s0..s3 accumulate (a_k − b_k)² for k ≡ lane (mod 4); the
// n%4 tail goes into s0; the result is (s0+s1)+(s2+s3), as sqdist.
TEXT ·sqdistAVX2(SB), NOSPLIT, $0-32
	MOVQ a+0(FP), SI
	MOVQ b+8(FP), DI
	MOVQ n+16(FP), CX
	VXORPD Y0, Y0, Y0

sloop:
	CMPQ CX, $4
	JLT  stail
	VMOVUPD (SI), Y1
	VMOVUPD (DI), Y2
	VSUBPD  Y2, Y1, Y1
	VMULPD  Y1, Y1, Y1
	VADDPD  Y1, Y0, Y0
	ADDQ    $32, SI
	ADDQ    $32, DI
	SUBQ    $4, CX
	JMP     sloop

stail:
	TESTQ CX, CX
	JZ    sdone
	VMOVSD (SI), X1
	VSUBSD (DI), X1, X1
	VMULSD X1, X1, X1
	VADDSD X1, X0, X3          // s0 + t² (upper lanes of X3 from X0)
	VBLENDPD $1, Y3, Y0, Y0    // put the new s0 into lane 0
	ADDQ   $8, SI
	ADDQ   $8, DI
	DECQ   CX
	JMP    stail

sdone:
	VEXTRACTF128 $1, Y0, X1    // (s2, s3)
	VPERMILPD $1, X0, X2       // s1
	VADDSD X2, X0, X2          // s0+s1
	VPERMILPD $1, X1, X3       // s3
	VADDSD X3, X1, X3          // s2+s3
	VADDSD X3, X2, X0
	VZEROUPPER
	MOVSD X0, ret+24(FP)
	RET

// func ward12AVX2(x *[12]float64, c *float64, d int, w *float64, out []float64, mask *uint64, ww, lim, limwx float64)
// As ward8AVX2 over the first twelve coordinates, lanes summed as
// sumHead12: u_j = (t_j² + t_{j+4}²) + t_{j+8}², s = (u0+u2) + (u1+u3).
TEXT ·ward12AVX2(SB), NOSPLIT, $0-88
	MOVQ x+0(FP), AX
	MOVQ c+8(FP), SI
	MOVQ d+16(FP), DX
	MOVQ w+24(FP), R8
	MOVQ out_base+32(FP), DI
	MOVQ out_len+40(FP), R12
	MOVQ mask+56(FP), R9
	VMOVSD ww+64(FP), X5
	VMOVSD lim+72(FP), X6
	VMOVSD limwx+80(FP), X7
	SHLQ $3, DX
	VMOVUPD (AX), Y0
	VMOVUPD 32(AX), Y1
	VMOVUPD 64(AX), Y8
	XORQ CX, CX
	XORQ R11, R11

tloop:
	TESTQ R12, R12
	JZ    tdone
	VMOVUPD (SI), Y2
	VMOVUPD 32(SI), Y3
	VMOVUPD 64(SI), Y9
	VSUBPD  Y2, Y0, Y2
	VSUBPD  Y3, Y1, Y3
	VSUBPD  Y9, Y8, Y9
	VMULPD  Y2, Y2, Y2
	VMULPD  Y3, Y3, Y3
	VMULPD  Y9, Y9, Y9
	VADDPD  Y3, Y2, Y2
	VADDPD  Y9, Y2, Y2         // u_j
	VEXTRACTF128 $1, Y2, X3
	VADDPD  X3, X2, X2         // (u0+u2, u1+u3)
	VPERMILPD $1, X2, X3
	VADDSD  X3, X2, X2
	VMOVSD  X2, (DI)
	VMULSD  X5, X2, X4
	VSUBSD  X6, X4, X4
	VMULSD  (R8), X4, X4
	XORQ    BX, BX
	VUCOMISD X7, X4
	SETLS   BX
	SHLQ    CX, BX
	ORQ     BX, R11
	ADDQ    DX, SI
	ADDQ    $8, DI
	ADDQ    $8, R8
	INCQ    CX
	CMPQ    CX, $64
	JNE     tnext
	MOVQ    R11, (R9)
	ADDQ    $8, R9
	XORQ    CX, CX
	XORQ    R11, R11

tnext:
	DECQ    R12
	JMP     tloop

tdone:
	TESTQ   CX, CX
	JZ      tret
	MOVQ    R11, (R9)

tret:
	VZEROUPPER
	RET

// func ward16AVX2(x *[16]float64, c *float64, d int, w *float64, out []float64, mask *uint64, ww, lim, limwx float64)
// As ward12AVX2 over the first sixteen coordinates, four candidates at a
// time: lanes u_j = ((t_j² + t_{j+4}²) + t_{j+8}²) + t_{j+12}², then
// s = (u0+u1) + (u2+u3) (sumHead16), and the pruning test on four lanes
// at once (VCMPPD, VMOVMSKPD). The last len(out)%4 candidates one by one.
TEXT ·ward16AVX2(SB), NOSPLIT, $0-88
	MOVQ x+0(FP), AX
	MOVQ c+8(FP), SI
	MOVQ d+16(FP), DX
	MOVQ w+24(FP), R8
	MOVQ out_base+32(FP), DI
	MOVQ out_len+40(FP), R12
	MOVQ mask+56(FP), R9
	VBROADCASTSD ww+64(FP), Y5
	VBROADCASTSD lim+72(FP), Y11
	VBROADCASTSD limwx+80(FP), Y12
	SHLQ $3, DX
	VMOVUPD (AX), Y0
	VMOVUPD 32(AX), Y1
	VMOVUPD 64(AX), Y8
	VMOVUPD 96(AX), Y10
	XORQ CX, CX                // bit index within the current word
	XORQ R11, R11              // current mask word

g4loop:
	CMPQ R12, $4
	JLT  g1loop
	LEAQ (SI)(DX*1), R10       // candidate b
	LEAQ (R10)(DX*1), R13      // candidate c
	// a
	VMOVUPD (SI), Y7
	VSUBPD  Y7, Y0, Y7
	VMULPD  Y7, Y7, Y2
	VMOVUPD 32(SI), Y9
	VSUBPD  Y9, Y1, Y9
	VMULPD  Y9, Y9, Y9
	VADDPD  Y9, Y2, Y2
	VMOVUPD 64(SI), Y7
	VSUBPD  Y7, Y8, Y7
	VMULPD  Y7, Y7, Y7
	VADDPD  Y7, Y2, Y2
	VMOVUPD 96(SI), Y9
	VSUBPD  Y9, Y10, Y9
	VMULPD  Y9, Y9, Y9
	VADDPD  Y9, Y2, Y2
	// b
	VMOVUPD (R10), Y7
	VSUBPD  Y7, Y0, Y7
	VMULPD  Y7, Y7, Y3
	VMOVUPD 32(R10), Y9
	VSUBPD  Y9, Y1, Y9
	VMULPD  Y9, Y9, Y9
	VADDPD  Y9, Y3, Y3
	VMOVUPD 64(R10), Y7
	VSUBPD  Y7, Y8, Y7
	VMULPD  Y7, Y7, Y7
	VADDPD  Y7, Y3, Y3
	VMOVUPD 96(R10), Y9
	VSUBPD  Y9, Y10, Y9
	VMULPD  Y9, Y9, Y9
	VADDPD  Y9, Y3, Y3
	// c
	VMOVUPD (R13), Y7
	VSUBPD  Y7, Y0, Y7
	VMULPD  Y7, Y7, Y4
	VMOVUPD 32(R13), Y9
	VSUBPD  Y9, Y1, Y9
	VMULPD  Y9, Y9, Y9
	VADDPD  Y9, Y4, Y4
	VMOVUPD 64(R13), Y7
	VSUBPD  Y7, Y8, Y7
	VMULPD  Y7, Y7, Y7
	VADDPD  Y7, Y4, Y4
	VMOVUPD 96(R13), Y9
	VSUBPD  Y9, Y10, Y9
	VMULPD  Y9, Y9, Y9
	VADDPD  Y9, Y4, Y4
	// d
	LEAQ    (R13)(DX*1), R10
	VMOVUPD (R10), Y7
	VSUBPD  Y7, Y0, Y7
	VMULPD  Y7, Y7, Y6
	VMOVUPD 32(R10), Y9
	VSUBPD  Y9, Y1, Y9
	VMULPD  Y9, Y9, Y9
	VADDPD  Y9, Y6, Y6
	VMOVUPD 64(R10), Y7
	VSUBPD  Y7, Y8, Y7
	VMULPD  Y7, Y7, Y7
	VADDPD  Y7, Y6, Y6
	VMOVUPD 96(R10), Y9
	VSUBPD  Y9, Y10, Y9
	VMULPD  Y9, Y9, Y9
	VADDPD  Y9, Y6, Y6
	// Sums: [a0+a1, b0+b1, a2+a3, b2+b3] and the same for c, d.
	VHADDPD Y3, Y2, Y2
	VHADDPD Y6, Y4, Y4
	VPERM2F128 $0x20, Y4, Y2, Y3 // [a01, b01, c01, d01]
	VPERM2F128 $0x31, Y4, Y2, Y6 // [a23, b23, c23, d23]
	VADDPD  Y6, Y3, Y3           // s for a, b, c, d
	VMOVUPD Y3, (DI)
	// Pruning test: w·(s·ww − lim) ≤ limwx.
	VMULPD  Y5, Y3, Y3
	VSUBPD  Y11, Y3, Y3
	VMOVUPD (R8), Y7
	VMULPD  Y7, Y3, Y3
	VCMPPD  $2, Y12, Y3, Y3
	VMOVMSKPD Y3, BX
	SHLQ    CX, BX
	ORQ     BX, R11
	LEAQ    (R10)(DX*1), SI
	ADDQ    $32, DI
	ADDQ    $32, R8
	SUBQ    $4, R12
	ADDQ    $4, CX
	CMPQ    CX, $64
	JNE     g4loop
	MOVQ    R11, (R9)
	ADDQ    $8, R9
	XORQ    CX, CX
	XORQ    R11, R11
	JMP     g4loop

g1loop:
	TESTQ R12, R12
	JZ    g1done
	VMOVUPD (SI), Y7
	VSUBPD  Y7, Y0, Y7
	VMULPD  Y7, Y7, Y2
	VMOVUPD 32(SI), Y9
	VSUBPD  Y9, Y1, Y9
	VMULPD  Y9, Y9, Y9
	VADDPD  Y9, Y2, Y2
	VMOVUPD 64(SI), Y7
	VSUBPD  Y7, Y8, Y7
	VMULPD  Y7, Y7, Y7
	VADDPD  Y7, Y2, Y2
	VMOVUPD 96(SI), Y9
	VSUBPD  Y9, Y10, Y9
	VMULPD  Y9, Y9, Y9
	VADDPD  Y9, Y2, Y2
	VEXTRACTF128 $1, Y2, X3    // [u2, u3]
	VHADDPD X2, X2, X2         // u0+u1
	VHADDPD X3, X3, X3         // u2+u3
	VADDSD  X3, X2, X2
	VMOVSD  X2, (DI)
	VMULSD  X5, X2, X4
	VSUBSD  X11, X4, X4
	VMULSD  (R8), X4, X4
	XORQ    BX, BX
	VUCOMISD X12, X4
	SETLS   BX
	SHLQ    CX, BX
	ORQ     BX, R11
	ADDQ    DX, SI
	ADDQ    $8, DI
	ADDQ    $8, R8
	INCQ    CX
	DECQ    R12
	JMP     g1loop

g1done:
	TESTQ   CX, CX
	JZ      g1ret
	MOVQ    R11, (R9)

g1ret:
	VZEROUPPER
	RET

// func rowDistAVX2(x *float64, c *float64, d int, out []float64)
// out[k] = sqrt of the squared distance between x and row k of c (stride
// d), summed exactly as sqdistAVX2 / sqdistGo sum (four lanes, tail into
// lane 0, then (s0+s1)+(s2+s3)); VSQRTSD is correctly rounded, as
// math.Sqrt.
TEXT ·rowDistAVX2(SB), NOSPLIT, $0-48
	MOVQ x+0(FP), AX
	MOVQ c+8(FP), SI
	MOVQ d+16(FP), DX
	MOVQ out_base+24(FP), DI
	MOVQ out_len+32(FP), R12

rrow:
	TESTQ R12, R12
	JZ    rdone
	MOVQ  AX, R10
	MOVQ  SI, R11
	MOVQ  DX, CX
	VXORPD Y0, Y0, Y0

rvec:
	CMPQ CX, $4
	JLT  rtail
	VMOVUPD (R10), Y1
	VMOVUPD (R11), Y2
	VSUBPD  Y2, Y1, Y1
	VMULPD  Y1, Y1, Y1
	VADDPD  Y1, Y0, Y0
	ADDQ    $32, R10
	ADDQ    $32, R11
	SUBQ    $4, CX
	JMP     rvec

rtail:
	TESTQ CX, CX
	JZ    rsum
	VMOVSD (R10), X1
	VSUBSD (R11), X1, X1
	VMULSD X1, X1, X1
	VADDSD X1, X0, X3
	VBLENDPD $1, Y3, Y0, Y0
	ADDQ   $8, R10
	ADDQ   $8, R11
	DECQ   CX
	JMP    rtail

rsum:
	VEXTRACTF128 $1, Y0, X1
	VPERMILPD $1, X0, X2
	VADDSD X2, X0, X2
	VPERMILPD $1, X1, X3
	VADDSD X3, X1, X3
	VADDSD X3, X2, X0
	VSQRTSD X0, X0, X0
	VMOVSD X0, (DI)
	LEAQ  (SI)(DX*8), SI
	ADDQ  $8, DI
	DECQ  R12
	JMP   rrow

rdone:
	VZEROUPPER
	RET
